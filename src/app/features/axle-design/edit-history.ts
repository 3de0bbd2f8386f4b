import { computed, signal } from '@angular/core';

/**
 * Undo / redo over immutable snapshots. `present` is the value on screen;
 * every `commit` pushes the previous one on the undo stack and clears redo.
 */
export class EditHistory<T> {
  private readonly past = signal<readonly T[]>([]);
  private readonly future = signal<readonly T[]>([]);
  private readonly current: ReturnType<typeof signal<T>>;

  readonly canUndo = computed(() => this.past().length > 0);
  readonly canRedo = computed(() => this.future().length > 0);

  constructor(
    initial: T,
    private readonly limit = 200,
  ) {
    this.current = signal(initial);
  }

  readonly present = computed(() => this.current());

  commit(next: T): void {
    if (Object.is(next, this.current())) return;
    this.past.update((p) => [...p, this.current()].slice(-this.limit));
    this.future.set([]);
    this.current.set(next);
  }

  undo(): void {
    const p = this.past();
    if (p.length === 0) return;
    this.future.update((f) => [this.current(), ...f]);
    this.current.set(p[p.length - 1]!);
    this.past.set(p.slice(0, -1));
  }

  redo(): void {
    const f = this.future();
    if (f.length === 0) return;
    this.past.update((p) => [...p, this.current()]);
    this.current.set(f[0]!);
    this.future.set(f.slice(1));
  }

  /** Starts over from `value` (after loading or saving), with no undo steps. */
  reset(value: T): void {
    this.past.set([]);
    this.future.set([]);
    this.current.set(value);
  }
}
