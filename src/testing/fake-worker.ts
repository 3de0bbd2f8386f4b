/**
 * A stand-in for the browser's Worker in component specs (jsdom has none):
 * it records what the client posts and lets the spec answer, fail or check
 * that the client ended it.
 */
export class FakeWorker {
  static created: FakeWorker[] = [];
  readonly posted: unknown[] = [];
  terminated = false;
  private readonly listeners = new Map<string, ((e: unknown) => void)[]>();

  constructor(
    readonly url: unknown,
    readonly options?: unknown,
  ) {
    FakeWorker.created.push(this);
  }

  addEventListener(type: string, listener: (e: unknown) => void): void {
    this.listeners.set(type, [...(this.listeners.get(type) ?? []), listener]);
  }

  postMessage(message: unknown): void {
    this.posted.push(message);
  }

  terminate(): void {
    this.terminated = true;
  }

  /** The worker answers (a `message` event with this data). */
  reply(data: unknown): void {
    for (const l of this.listeners.get('message') ?? []) l({ data });
  }

  /** The worker fails (an `error` event). */
  fail(message: string): void {
    for (const l of this.listeners.get('error') ?? []) l({ message });
  }
}
