/**
 * The corner document schema used at every door (HTTP, CLI, worker, stored
 * JSON): a document from a newer Rollwise is an ordinary field issue at
 * `…formatVersion`, reported by safeParse rather than thrown, so the caller's
 * message names the field (issue 3: "Each message names the point";
 * issue 8: "a 4xx with a message that names the field").
 */
import { describe, expect, it } from 'vitest';
import { cornerDocumentSchema } from '../../../shared/schema/corner.js';
import { exampleCorners } from '../../../shared/kinematics/index.js';
import { computeCornerSweep } from '../../../shared/kinematics/api.js';
import { InputError } from '../../../shared/errors.js';

describe('cornerDocumentSchema', () => {
  it('reports a newer formatVersion as an issue at formatVersion instead of throwing', () => {
    const r = cornerDocumentSchema.safeParse({ ...exampleCorners.fsFrontWishbone, formatVersion: 7 });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join('.'))).toContain('formatVersion');
    expect(r.error!.issues[0]!.message).toMatch(/newer Rollwise/);
  });

  it('reads an unversioned document as version 1', () => {
    const { formatVersion: _v, ...unversioned } = exampleCorners.fsRearWishbone;
    const r = cornerDocumentSchema.safeParse(unversioned);
    expect(r.success).toBe(true);
    expect(r.data!.formatVersion).toBe(1);
  });

  it('a request with a newer corner names corner.formatVersion', () => {
    const input = { corner: { ...exampleCorners.fsFrontWishbone, formatVersion: 2 }, travel: { from: -10, to: 10, step: 5 } };
    let caught: unknown;
    try {
      computeCornerSweep(input);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as InputError).issues.map((i) => i.path)).toContain('corner.formatVersion');
  });
});
