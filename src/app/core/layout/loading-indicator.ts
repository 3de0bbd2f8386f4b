import { computed, Injectable, signal } from '@angular/core';

/** Counts work in flight (HTTP requests, route loads) for the top bar's progress bar. */
@Injectable({ providedIn: 'root' })
export class LoadingIndicator {
  private readonly pending = signal(0);

  /** True while at least one request or navigation is in flight. */
  readonly busy = computed(() => this.pending() > 0);

  begin(): void {
    this.pending.update((n) => n + 1);
  }

  end(): void {
    this.pending.update((n) => Math.max(0, n - 1));
  }
}
