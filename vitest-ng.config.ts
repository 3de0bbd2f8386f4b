import { defineConfig } from 'vitest/config';

// Extra settings for the Angular component specs (`ng test`), merged into the
// builder's own vitest set-up through angular.json's `runnerConfig`.
// Vitest's 5 s default is a wall-clock limit: on a busy 2-core machine a spec
// that renders a large page (configuration, vehicle) can take longer, time out,
// and leave TestBed half set up for the next spec, so one slow spec fails a
// whole file. A generous limit keeps the outcome independent of machine load;
// it is a runner limit, not a tolerance on any result.
export default defineConfig({
  test: {
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
