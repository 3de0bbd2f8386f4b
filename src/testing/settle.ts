import { TestBed } from '@angular/core/testing';

/**
 * Lets the page send the requests it is about to send, without waiting for stability.
 *
 * A loading resource (rxResource) and an open HttpClient request each hold one of
 * Angular's pending tasks, so `fixture.whenStable()` cannot resolve while a request
 * waits for `HttpTestingController` to answer it: awaiting it before the flush would
 * wait for ever. This runs the queued macrotasks and microtasks (promise chains that
 * lead to a request), then change detection and effects (which start resources), so
 * the next `expectOne(...)` finds the request. Use `whenStable()` after the flush.
 */
export async function settle(): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  TestBed.tick();
  await new Promise((resolve) => setTimeout(resolve, 0));
}
