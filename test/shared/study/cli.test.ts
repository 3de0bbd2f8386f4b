/** `rollwise study --spec FILE`, run in-process through the program's runner. Source: issue 16 ("the same studies from the CLI … printing JSON") and the CLI's contract (exit 2 naming the field). */
import { describe, expect, it } from 'vitest';
import { runCli } from '../../support/cli.js';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..', '..', '..');
const fixture = (n: string) => join(root, 'test', 'fixtures', 'studies', n);

// In-process: the program's own runner with collected output (test/support/cli.ts).
const run = runCli;

describe('rollwise study', { timeout: 120_000 }, () => {
  it('runs a tolerance study from a spec naming its documents and prints the result as JSON', async () => {
    const r = await run('study', '--spec', fixture('tolerance-fs-front.json'));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.plan.totalSamples).toBe(400);
    expect(out.result.kind).toBe('tolerance');
    const eps = out.result.outputs.find((o: { key: string }) => o.key === 'rollSteerCoefficient');
    expect(eps.p5).toBeLessThan(eps.p50);
    expect(eps.p50).toBeLessThan(eps.p95);
    expect(eps.histogram.counts.reduce((a: number, b: number) => a + b, 0)).toBe(out.result.validSamples);
    expect(eps.tornado[0].factor).toMatch(/^(left|right)\./);
    expect(out.result.outputs.some((o: { key: string }) => o.key === 'understeerGradientChangeDegPerG')).toBe(true);
  });

  it('bad input exits 2 naming the field', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'rollwise-study-'));
    const spec = JSON.parse(readFileSync(fixture('tolerance-fs-front.json'), 'utf8'));
    spec.corner = JSON.parse(readFileSync(join(root, 'test', 'fixtures', 'corners', 'fs-front-wishbone.json'), 'utf8'));
    spec.vehicle = JSON.parse(readFileSync(join(root, 'test', 'fixtures', 'vehicles', 'tur26-ember.json'), 'utf8'));
    spec.tolerances[1].plusMinusMm = -1;
    const file = join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify(spec));
    const a = await run('study', '--spec', file);
    expect(a.code).toBe(2);
    expect(a.stderr).toContain('tolerances[1].plusMinusMm');
    spec.tolerances[1].plusMinusMm = 1;
    spec.kind = 'sweep';
    writeFileSync(file, JSON.stringify(spec));
    const b = await run('study', '--spec', file);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/design|factors|balanceDirection|tolerances/);
    const c = await run('study', '--spec', join(dir, 'missing.json'));
    expect(c.code).toBe(2);
    expect(c.stderr).toContain('--spec');
  });
});
