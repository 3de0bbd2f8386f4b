import type { ProposalDetails, SolveResult } from '../../../shared/intent/index';
import { exampleCorners } from '../../../shared/kinematics/examples';
import { intentSchema } from '../../../shared/schema/intent';
import { FakeWorker } from '../../testing/fake-worker';
import { IntentClient } from './intent-client';
import { AnalysisError, AnalysisSuperseded } from './kinematics-client';

/** A front roll-steer target on the example FS front corner, the tie-rod inner height free within ±5 mm (test/fixtures/intents). */
const intent = (rollSteerCoefficient: number) => ({
  axle: 'front',
  target: { rollSteerCoefficient },
  movable: ['tieRodInner.z'],
  bounds: { 'tieRodInner.z': [136, 146] },
  trackProfile: 'smooth-circuit',
  corner: exampleCorners.fsFrontWishbone,
});

describe('IntentClient', () => {
  let client: IntentClient;

  beforeEach(() => {
    FakeWorker.created = [];
    vi.stubGlobal('Worker', FakeWorker);
    client = new IntentClient();
  });

  afterEach(() => {
    client.ngOnDestroy();
    vi.unstubAllGlobals();
  });

  it('reports progress, resolves with the result and ends the worker', async () => {
    const progress: [number, string][] = [];
    const solve = client.solve(intent(0.02), (f, m) => progress.push([f, m]));
    const worker = FakeWorker.created[0]!;
    const { id, intent: posted } = worker.posted[0] as { id: number; intent: unknown };
    // The worker gets the page's parse of the document (defaults filled in), not the raw entries.
    expect(posted).toEqual(intentSchema.parse(intent(0.02)));

    worker.reply({ id, kind: 'progress', fraction: 0.5, message: 'half way' });
    worker.reply({ id: id + 1, kind: 'progress', fraction: 0.9, message: 'another solve' });
    const result = { solutions: [] } as unknown as SolveResult;
    worker.reply({ id, kind: 'done', result });
    await expect(solve).resolves.toBe(result);
    expect(progress).toEqual([[0.5, 'half way']]);
    expect(worker.terminated).toBe(true);
  });

  it('rejects with the engine failure', async () => {
    const solve = client.solve(intent(0.02), () => undefined);
    const worker = FakeWorker.created[0]!;
    const { id } = worker.posted[0] as { id: number };
    worker.reply({ id, kind: 'failed', failure: { code: 'no_solution', message: 'no heights inside the bounds' } });
    const error = await solve.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AnalysisError);
    expect((error as AnalysisError).failure.code).toBe('no_solution');
  });

  it('refuses an invalid intent in the page, naming the field, and starts no worker', async () => {
    const solve = client.solve({ ...intent(0.02), bounds: { 'tieRodInner.z': [146, 'high'] } }, () => undefined);
    const error = await solve.catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AnalysisError);
    expect((error as AnalysisError).failure.code).toBe('invalid_input');
    expect(JSON.stringify((error as AnalysisError).failure.details)).toContain('bounds');
    const details = await client.details({ ...intent(0.02), axle: 'middle' }, { 'tieRodInner.z': 140 }).catch((e: unknown) => e);
    expect((details as AnalysisError).failure.code).toBe('invalid_input');
    expect(FakeWorker.created).toEqual([]);
  });

  it('cancels a running solve: the promise rejects as cancelled and the worker ends', async () => {
    const solve = client.solve(intent(0.02), () => undefined);
    client.cancel();
    const error = await solve.catch((e: unknown) => e);
    expect((error as AnalysisError).failure.code).toBe('cancelled');
    expect(FakeWorker.created[0]!.terminated).toBe(true);
  });

  it('a new solve cancels the one before it', async () => {
    const first = client.solve(intent(0.01), () => undefined);
    void client.solve(intent(0.02), () => undefined).catch(() => undefined);
    const error = await first.catch((e: unknown) => e);
    expect((error as AnalysisError).failure.code).toBe('cancelled');
    expect(FakeWorker.created).toHaveLength(2);
    expect(FakeWorker.created[0]!.terminated).toBe(true);
  });

  it('rejects when the worker itself fails', async () => {
    const solve = client.solve(intent(0.02), () => undefined);
    FakeWorker.created[0]!.fail('script error');
    const error = await solve.catch((e: unknown) => e);
    expect((error as AnalysisError).failure).toEqual({ code: 'worker_failed', message: 'The solver worker failed: script error' });
  });

  it('works out a member in its own worker, without stopping a running solve', async () => {
    const solve = client.solve(intent(0.01), () => undefined);
    const details = client.details(intent(0.01), { 'tieRodInner.z': 140 });
    const [solver, member] = FakeWorker.created;
    expect(solver!.terminated).toBe(false);
    const { id, member: asked } = member!.posted[0] as { id: number; member: unknown };
    expect(asked).toEqual({ 'tieRodInner.z': 140 });
    const value = { rollSteerCoefficient: 0.02 } as unknown as ProposalDetails;
    member!.reply({ id, kind: 'details', details: value });
    await expect(details).resolves.toBe(value);
    expect(member!.terminated).toBe(true);
    client.cancel();
    await solve.catch(() => undefined);
  });

  it('a newer member request supersedes the one before', async () => {
    const first = client.details(intent(0.02), { a: 1 });
    void client.details(intent(0.02), { a: 2 }).catch(() => undefined);
    await expect(first).rejects.toBeInstanceOf(AnalysisSuperseded);
    expect(FakeWorker.created[0]!.terminated).toBe(true);
  });
});
