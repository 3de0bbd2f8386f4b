import { inject, Injectable, Injector } from '@angular/core';
import type { MatSnackBar } from '@angular/material/snack-bar';

export interface NoticeOptions {
  /** Button text, e.g. "Dismiss". Without it the notice only times out. */
  readonly action?: string;
  readonly durationMs?: number;
  /** Errors interrupt the screen reader; confirmations wait politely. */
  readonly assertive?: boolean;
}

/**
 * Short messages in a snackbar. The snackbar code (and the CDK overlay it
 * needs) loads on the first message, so the sign-in page stays small.
 */
@Injectable({ providedIn: 'root' })
export class Notifier {
  private readonly injector = inject(Injector);
  private snackBar: Promise<MatSnackBar> | null = null;

  /** A confirmation ("Vehicle created."). */
  info(message: string, options: NoticeOptions = {}): Promise<void> {
    return this.show(message, { durationMs: 4000, ...options });
  }

  /** A failure; stays longer and can be dismissed. */
  error(message: string, options: NoticeOptions = {}): Promise<void> {
    return this.show(message, { action: 'Dismiss', durationMs: 8000, assertive: true, ...options });
  }

  private async show(message: string, options: NoticeOptions): Promise<void> {
    this.snackBar ??= import('@angular/material/snack-bar').then((m) =>
      this.injector.get(m.MatSnackBar),
    );
    const snackBar = await this.snackBar;
    snackBar.open(message, options.action, {
      ...(options.durationMs === undefined ? {} : { duration: options.durationMs }),
      politeness: options.assertive ? 'assertive' : 'polite',
    });
  }
}
