import { exampleCorners } from '../../../shared/kinematics/examples';
import { FakeWorker } from '../../testing/fake-worker';
import type { AnalysisRequest, CornerAnalysis } from './analysis-types';
import { AnalysisError, AnalysisSuperseded, KinematicsClient } from './kinematics-client';

const request = (travelMm: number): AnalysisRequest => ({
  corner: exampleCorners.fsFrontWishbone,
  travel: { from: -25, to: 25, step: 5 },
  rackMm: [0],
  roll: { from: -2, to: 2, step: 1 },
  pose: { travelMm, rackMm: 0 },
});

/** What the client posted to the worker: `{ id, request }`. */
const posted = (w: FakeWorker, i: number) => w.posted[i] as { id: number; request: AnalysisRequest };

describe('KinematicsClient with a Web Worker', () => {
  let client: KinematicsClient;

  beforeEach(() => {
    FakeWorker.created = [];
    vi.stubGlobal('Worker', FakeWorker);
    client = new KinematicsClient();
  });

  afterEach(() => {
    client.ngOnDestroy();
    vi.unstubAllGlobals();
  });

  it('runs one request at a time and, of those waiting, solves only the newest', async () => {
    const first = client.analyse(request(1));
    const second = client.analyse(request(2));
    const third = client.analyse(request(3));
    await expect(second).rejects.toBeInstanceOf(AnalysisSuperseded);

    const worker = FakeWorker.created[0]!;
    expect(FakeWorker.created).toHaveLength(1);
    expect(worker.posted).toHaveLength(1);
    expect(posted(worker, 0).request.pose.travelMm).toBe(1);

    const answer = { pose: null } as unknown as CornerAnalysis;
    worker.reply({ id: posted(worker, 0).id, ok: true, analysis: answer });
    await expect(first).resolves.toBe(answer);
    // The newest waiting request goes to the same worker once the first is answered.
    expect(worker.posted).toHaveLength(2);
    expect(posted(worker, 1).request.pose.travelMm).toBe(3);

    worker.reply({ id: posted(worker, 1).id, ok: false, failure: { code: 'travel_unreachable', message: 'cannot reach 3 mm' } });
    const error = await third.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AnalysisError);
    expect((error as AnalysisError).failure.code).toBe('travel_unreachable');
  });

  it('ignores a reply to a request it is not running', async () => {
    const job = client.analyse(request(1));
    const worker = FakeWorker.created[0]!;
    const answer = { pose: null } as unknown as CornerAnalysis;
    worker.reply({ id: posted(worker, 0).id + 100, ok: true, analysis: { stale: true } });
    worker.reply({ id: posted(worker, 0).id, ok: true, analysis: answer });
    await expect(job).resolves.toBe(answer);
  });

  it('rejects the running request when the worker fails, and starts a new worker for the next', async () => {
    const job = client.analyse(request(1));
    const broken = FakeWorker.created[0]!;
    broken.fail('out of memory');
    const error = await job.catch((e: unknown) => e);
    expect((error as AnalysisError).failure).toEqual({ code: 'worker_failed', message: 'The kinematics worker failed: out of memory' });
    expect(broken.terminated).toBe(true);

    void client.analyse(request(2)).catch(() => undefined);
    expect(FakeWorker.created).toHaveLength(2);
    expect(posted(FakeWorker.created[1]!, 0).request.pose.travelMm).toBe(2);
  });

  it('ends the worker and rejects what is pending when the page goes away', async () => {
    const running = client.analyse(request(1));
    const waiting = client.analyse(request(2));
    client.ngOnDestroy();
    await expect(running).rejects.toBeInstanceOf(AnalysisSuperseded);
    await expect(waiting).rejects.toBeInstanceOf(AnalysisSuperseded);
    expect(FakeWorker.created[0]!.terminated).toBe(true);
  });
});

describe('KinematicsClient without Worker support', () => {
  it('runs the same engine in the page', async () => {
    vi.stubGlobal('Worker', undefined);
    const client = new KinematicsClient();
    try {
      const analysis = await client.analyse(request(0));
      // One curve per rack position, one point per travel step (−25 to 25 mm by 5 mm).
      expect(analysis.curves).toHaveLength(1);
      expect(analysis.curves[0]!.points.map((p) => p.travelMm)).toEqual([-25, -20, -15, -10, -5, 0, 5, 10, 15, 20, 25]);
      expect(Number.isFinite(analysis.rollSteerCoefficient)).toBe(true);
    } finally {
      client.ngOnDestroy();
      vi.unstubAllGlobals();
    }
  });
});
