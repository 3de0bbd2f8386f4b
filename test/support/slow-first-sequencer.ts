/**
 * Test files in a fixed slowest-first order, then vitest's own order. With
 * two files at a time, a long file that starts last runs alone at the end
 * (on a fresh clone vitest has no recorded durations and orders by file
 * size, so the 60 s look-pages walk started last and ran alone for a
 * minute). Starting the longest first lets the short ones fill the other
 * worker. Only the schedule changes: every file is independent of the
 * others (own server, own database copy), so any order gives the same
 * results. The list is by measured wall time in a fresh-clone `npm test`
 * (server and browser lanes); a file not listed keeps vitest's order after them.
 */
import { BaseSequencer, type TestSpecification } from 'vitest/node';

const SLOWEST_FIRST = [
  // API lane: the real-queue studies (workers spawned and killed) and the compute fuzzing.
  'test/server/queue-studies.test.ts',
  'test/server/fuzz-compute.test.ts',
  'test/server/queue-solve-jobs.test.ts',
  'test/server/faults.test.ts',
  'test/server/concurrency.test.ts',
  'test/server/compute.test.ts',
  'test/server/access-routes.test.ts',
  'test/server/queue-worker-priority.test.ts',
  // Browser lane.
  'test/e2e/editor.test.ts',
  'test/e2e/review.test.ts',
  'test/e2e/programme.test.ts',
  'test/e2e/intent.test.ts',
  'test/e2e/look-pages.test.ts',
  'test/e2e/study.test.ts',
  'test/e2e/shell.test.ts',
];

export class SlowFirstSequencer extends BaseSequencer {
  override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
    const own = await super.sort(files);
    const rank = (f: TestSpecification) => {
      const i = SLOWEST_FIRST.findIndex((p) => f.moduleId.replaceAll('\\', '/').endsWith(p));
      return i < 0 ? SLOWEST_FIRST.length : i;
    };
    // Array.prototype.sort is stable: unlisted files keep vitest's order.
    return [...own].sort((a, b) => rank(a) - rank(b));
  }
}
