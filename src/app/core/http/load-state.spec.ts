import { HttpErrorResponse } from '@angular/common/http';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { rxResource } from '@angular/core/rxjs-interop';
import { Subject } from 'rxjs';
import { loadState } from './load-state';

describe('loadState', () => {
  it('walks loading → ready, keeps the value shown while reloading, and shows a new id as loading', async () => {
    const id = signal('a');
    const answers = new Map<string, Subject<string>>();
    const state = TestBed.runInInjectionContext(() => {
      const r = rxResource({
        params: () => id(),
        stream: ({ params }) => {
          const s = new Subject<string>();
          answers.set(params, s);
          return s;
        },
      });
      return { r, state: loadState(r) };
    });
    TestBed.tick();
    expect(state.state()).toEqual({ status: 'loading' });
    answers.get('a')!.next('value a');
    await Promise.resolve();
    TestBed.tick();
    expect(state.state()).toEqual({ status: 'ready', value: 'value a' });

    state.r.reload();
    TestBed.tick();
    expect(state.state()).toEqual({ status: 'ready', value: 'value a' });

    id.set('b');
    TestBed.tick();
    expect(state.state()).toEqual({ status: 'loading' });
  });

  it('shows the API message of a failed request', async () => {
    const answer = new Subject<string>();
    const state = TestBed.runInInjectionContext(() => loadState(rxResource({ stream: () => answer })));
    TestBed.tick();
    answer.error(new HttpErrorResponse({ status: 404, error: { error: { code: 'not_found', message: 'No such team.' } } }));
    await Promise.resolve();
    TestBed.tick();
    expect(state()).toEqual({ status: 'error', message: 'No such team.' });
  });
});
