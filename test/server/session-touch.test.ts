/**
 * The session store's touch is throttled per session (server/http/session.ts):
 * a client firing many requests must not queue UPDATEs on its one session row.
 * The store here records calls; the real PostgreSQL store is exercised by the
 * idle-timeout tests in http.test.ts.
 */
import { describe, expect, it, vi, afterEach } from 'vitest';
import type session from 'express-session';
import { throttleTouch } from '../../server/http/session.js';

function recordingStore() {
  const calls: string[] = [];
  return {
    calls,
    touch(sid: string, _sess: session.SessionData, fn?: (err?: unknown) => void) {
      calls.push(sid);
      fn?.();
    },
  };
}
const sess = {} as session.SessionData;

afterEach(() => vi.useRealTimers());

describe('throttleTouch', () => {
  it('lets one touch per session through per interval and always calls back', () => {
    vi.useFakeTimers({ now: 1_000_000 });
    const store = recordingStore();
    throttleTouch(store, 60_000);
    const done = vi.fn();
    for (let i = 0; i < 50; i++) store.touch('a', sess, done);
    store.touch('b', sess, done);
    expect(store.calls).toEqual(['a', 'b']);
    expect(done).toHaveBeenCalledTimes(51);
    vi.advanceTimersByTime(59_999);
    store.touch('a', sess, done);
    expect(store.calls).toEqual(['a', 'b']);
    vi.advanceTimersByTime(1);
    store.touch('a', sess, done);
    expect(store.calls).toEqual(['a', 'b', 'a']);
  });

  it('forgets everything once it tracks too many sessions, so memory stays bounded', () => {
    vi.useFakeTimers({ now: 1_000_000 });
    const store = recordingStore();
    throttleTouch(store, 60_000, 3);
    for (const sid of ['a', 'b', 'c', 'd', 'a']) store.touch(sid, sess);
    // 'd' arrives with three tracked: the map is cleared, so the later 'a' goes through again.
    expect(store.calls).toEqual(['a', 'b', 'c', 'd', 'a']);
  });
});
