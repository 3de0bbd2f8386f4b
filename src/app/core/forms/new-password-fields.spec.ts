import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MIN_PASSWORD_LENGTH, matchingPasswords } from '../auth/password-rules';
import { NewPasswordFields } from './new-password-fields';

@Component({
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [ReactiveFormsModule, NewPasswordFields],
  template: `<form [formGroup]="form">
    <rw-new-password-fields label="New password" repeatLabel="Repeat new password" requiredMessage="Choose a new password." passwordControl="newPassword" />
  </form>`,
})
class Host {
  readonly form = new FormGroup(
    {
      newPassword: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)] }),
      confirm: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    },
    { validators: matchingPasswords('newPassword', 'confirm') },
  );
}

describe('NewPasswordFields', () => {
  async function render() {
    TestBed.configureTestingModule({ imports: [Host] });
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const root = fixture.nativeElement as HTMLElement;
    const input = (name: string) => root.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;
    const type = async (name: string, value: string) => {
      input(name).value = value;
      input(name).dispatchEvent(new Event('input'));
      input(name).dispatchEvent(new Event('blur'));
      await fixture.whenStable();
    };
    return { fixture, root, input, type };
  }

  it('binds to the named controls of the parent form, with the given labels', async () => {
    const { fixture, root, type } = await render();
    await type('newPassword', 'long-enough-pass');
    await type('confirm', 'long-enough-pass');
    expect(fixture.componentInstance.form.value).toEqual({ newPassword: 'long-enough-pass', confirm: 'long-enough-pass' });
    expect([...root.querySelectorAll('mat-label')].map((l) => l.textContent?.trim())).toEqual(['New password', 'Repeat new password']);
  });

  it('shows the required, length and mismatch messages', async () => {
    const { root, type } = await render();
    await type('newPassword', '');
    await type('confirm', '');
    expect([...root.querySelectorAll('mat-error')].map((e) => e.textContent?.trim())).toEqual(['Choose a new password.', 'Repeat the password.']);
    await type('newPassword', 'short');
    expect(root.querySelector('mat-error')!.textContent).toContain(`Use at least ${MIN_PASSWORD_LENGTH} characters.`);
    await type('newPassword', 'long-enough-pass');
    await type('confirm', 'another-long-pass');
    expect(root.querySelector('[role="alert"]')!.textContent?.trim()).toBe('The two passwords differ.');
  });
});
