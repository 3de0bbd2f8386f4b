import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { App } from './app';

describe('App shell', () => {
  beforeEach(async () => {
    await TestBed.configureTestingModule({
      imports: [App],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    }).compileComponents();
  });

  it('shows the product name and a skip link while nobody is signed in', async () => {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    expect(root.querySelector('.plain-brand')?.textContent?.trim()).toBe('Rollwise');
    expect(root.querySelector('.skip-link')?.textContent?.trim()).toBe('Skip to content');
    expect(root.querySelector('app-top-bar')).toBeNull();
    TestBed.inject(HttpTestingController).verify();
  });

  it('moves focus to the main region from the skip link', async () => {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    document.body.appendChild(root);
    root.querySelector<HTMLButtonElement>('.skip-link')!.click();
    expect(document.activeElement).toBe(root.querySelector('main'));
    root.remove();
  });
});
