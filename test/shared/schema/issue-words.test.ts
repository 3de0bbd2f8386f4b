/**
 * Schema issues in the user's words (issue 15 §1): the value and what is
 * wrong with it, never a document key or zod's own wording.
 */
import { describe, expect, it } from 'vitest';
import { intentSchema, intentTargetSchema } from '../../../shared/schema/intent.js';
import { issueWords, type FigureWords } from '../../../shared/schema/issue-words.js';
import { exampleCorners } from '../../../shared/kinematics/index.js';

const words = (schema: { safeParse(v: unknown): { success: boolean; error?: { issues: unknown[] } } }, input: unknown, labels?: Record<string, string>) =>
  (schema.safeParse(input).error?.issues ?? []).map((i) => issueWords(i as Parameters<typeof issueWords>[0], input, labels));

describe('issueWords', () => {
  it('a target outside its range: "5 is outside −1 to 1"', () => {
    expect(words(intentTargetSchema, { rollSteerCoefficient: 5 })).toEqual(['5 is outside −1 to 1 deg/deg']);
    expect(words(intentTargetSchema, { understeerChangeDegPerG: -25 })).toEqual(['−25 is outside −20 to 20 deg/g']);
  });

  it('a value that is not a number asks for one', () => {
    expect(words(intentTargetSchema, { rollSteerCoefficient: Number.NaN })).toEqual(['enter a number']);
  });

  it('a strictly positive value refused at zero says so with its unit', () => {
    const base = {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      target: { rollSteerCoefficient: 0.02 },
      movable: ['tieRodInner.z'],
      bounds: { 'tieRodInner.z': [130, 160] },
      trackProfile: 'smooth-circuit',
      options: { shimThicknessMm: 0 },
    };
    const w = words(intentSchema, base);
    expect(w).toHaveLength(1);
    expect(w[0]).toMatch(/^0 mm is outside the possible shim thickness: give a value above 0 mm and at most 50 mm$/);
  });

  it('writes lengths in the user’s units with the formatter it is given (1 in = 25.4 mm exactly)', () => {
    const inches: FigureWords = (v, unit) => (unit === 'mm' ? { value: String(Math.round((v / 25.4) * 1000) / 1000), unit: 'in' } : { value: String(v), unit });
    const doc = {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      target: { rollSteerCoefficient: 0.02 },
      movable: ['tieRodInner.z'],
      bounds: { 'tieRodInner.z': [160 * 25.4, 130 * 25.4] },
      trackProfile: { id: 'smooth-circuit', travelMm: [25.4, 50.8] },
      options: { shimThicknessMm: 0 },
    };
    const w = (intentSchema.safeParse(doc).error?.issues ?? []).map((i) => issueWords(i as Parameters<typeof issueWords>[0], doc, {}, inches));
    expect(w).toContain('0 in is outside the possible shim thickness: give a value above 0 in and at most 1.969 in');
    expect(w).toContain('the lowest, 160 in, must be below the highest, 130 in');
    expect(w).toContain('the travel range 1 to 2 in must run from droop (below 0) to bump (above 0)');
    expect(w.join(' ')).not.toMatch(/\bmm\b/);
  });

  it('every issue at once, document keys replaced by the screen’s labels', () => {
    const bad = {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      target: { rollSteerCoefficient: 0.02 },
      movable: ['tieRodInner.z', 'rack.z'],
      bounds: { 'tieRodInner.z': [160, 130], 'rack.z': [-5, 5] },
      trackProfile: { id: 'smooth-circuit', travelMm: [5, 20] },
    };
    const w = words(intentSchema, bad, { 'tieRodInner.z': 'the inner end’s height', 'rack.z': 'the rack height' });
    expect(w).toContain('the lowest, 160 mm, must be below the highest, 130 mm');
    expect(w).toContain('the travel range 5 to 20 mm must run from droop (below 0) to bump (above 0)');
    expect(w.some((m) => m.startsWith('the rack height and the inner end’s height move the same point'))).toBe(true);
    expect(w.join(' ')).not.toMatch(/tieRodInner|rack\.z|trackProfile/);
  });

  it('a bad number does not hide the document’s other rules: every problem comes at once', () => {
    const bad = {
      corner: exampleCorners.fsFrontWishbone,
      axle: 'front',
      target: { rollSteerCoefficient: 5 },
      movable: ['tieRodInner.z'],
      bounds: { 'tieRodInner.z': [160, Number.NaN] },
      trackProfile: { id: 'smooth-circuit', travelMm: [10, 20] },
      options: { shimThicknessMm: Number.NaN },
    };
    const r = intentSchema.safeParse(bad);
    const paths = (r.error?.issues ?? []).map((i) => i.path.join('.'));
    expect(paths.sort()).toEqual(['bounds.tieRodInner.z.1', 'options.shimThicknessMm', 'target.rollSteerCoefficient', 'trackProfile.travelMm']);
  });
});
