import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ENGINE_VERSION } from '../../shared/version';
import { App } from './app';
import { LoadingIndicator } from './core/layout/loading-indicator';

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
    expect(root.querySelector('rw-top-bar')).toBeNull();
    const backend = TestBed.inject(HttpTestingController);
    backend.expectOne('/api/health').flush({ status: 'ok', database: 'reachable', engineVersion: ENGINE_VERSION });
    await fixture.whenStable();
    expect(root.querySelector('.engine-banner')).toBeNull();
    backend.verify();
  });

  it("asks to reload when the server's engine version differs from the page's", async () => {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    // A degraded server still names its version.
    TestBed.inject(HttpTestingController)
      .expectOne('/api/health')
      .flush(
        { status: 'degraded', database: 'unreachable', engineVersion: '999.0.0' },
        { status: 503, statusText: 'Service Unavailable' },
      );
    await fixture.whenStable();
    const banner = (fixture.nativeElement as HTMLElement).querySelector('.engine-banner');
    expect(banner?.getAttribute('role')).toBe('alert');
    expect(banner?.textContent).toContain('999.0.0');
    expect(banner?.textContent).toContain(ENGINE_VERSION);
    expect(banner?.querySelector('button')?.textContent?.trim()).toBe('Reload');
  });

  it('shows the loading bar (a labelled progressbar) only while work is in flight', async () => {
    const fixture = TestBed.createComponent(App);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const loading = TestBed.inject(LoadingIndicator);
    TestBed.inject(HttpTestingController).expectOne('/api/health').flush({ status: 'ok', database: 'reachable', engineVersion: ENGINE_VERSION });
    await fixture.whenStable();
    expect(root.querySelector('.rw-busy-bar')).toBeNull();
    loading.begin();
    await fixture.whenStable();
    expect(root.querySelector('.rw-busy-bar[role="progressbar"]')?.getAttribute('aria-label')).toBe('Loading');
    loading.end();
    await fixture.whenStable();
    expect(root.querySelector('.rw-busy-bar')).toBeNull();
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
