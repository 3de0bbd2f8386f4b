/**
 * Spec helper (component specs only): answers every pending request of the
 * testing backend from a table keyed "METHOD /path", until none is left.
 * An unexpected request fails the spec with its method and URL.
 */
import { HttpTestingController, TestRequest } from '@angular/common/http/testing';

export type Answer = unknown | ((req: TestRequest) => unknown);

export const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

export async function serve(backend: HttpTestingController, table: Record<string, Answer>, rounds = 12): Promise<string[]> {
  const seen: string[] = [];
  for (let i = 0; i < rounds; i++) {
    await settle();
    const pending = backend.match(() => true);
    if (pending.length === 0 && i > 2) break;
    for (const req of pending) {
      const key = `${req.request.method} ${req.request.url}`;
      seen.push(key);
      if (!(key in table)) throw new Error(`unexpected request ${key}`);
      const a = table[key];
      if (typeof a === 'function') {
        const body = (a as (r: TestRequest) => unknown)(req);
        if (body !== undefined && !req.cancelled) req.flush(body);
      } else if (!req.cancelled) req.flush(a as never);
    }
  }
  return seen;
}

/** Flushes an API error of the one shape (server/http/errors.ts). */
export function refuse(status: number, code: string, message: string) {
  return (req: TestRequest) => {
    req.flush({ error: { code, message } }, { status, statusText: 'refused' });
    return undefined;
  };
}
