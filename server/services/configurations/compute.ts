/**
 * What a configuration revision stands for (its vehicle and corner documents
 * and track profile) and what the shared engines compute from it, through the
 * compute pool; nothing here does engineering math.
 */
import { and, eq } from 'drizzle-orm';
import type { Orm } from '../../db/client.js';
import { axleDesignRevisions, vehicleRevisions } from '../../db/schema.js';
import type { ComputePool } from '../../compute/pool.js';
import { notFound } from '../../../shared/errors.js';
import { ENGINE_VERSION } from '../../../shared/version.js';
import { configurationAnalysis, configurationRequests } from '../../../shared/configuration/analyse.js';
import type { BalanceResponse } from '../../../shared/balance/api.js';
import type { SweepResult } from '../../../shared/kinematics/index.js';
import { upgradeVehicleDocument } from '../../../shared/schema/vehicle.js';
import type { ConfigurationInputs, ConfigurationResults } from '../../../shared/api/configurations.js';
import { diffDocuments, type Difference } from '../document-diff.js';
import { storedCorner } from '../axle-designs.js';
import type { ConfigurationRefs, ConfigurationStore } from './store.js';

export type { ConfigurationInputs, ConfigurationResults };

/** Result differences as key figures: curves, tables and echoed inputs left out. */
export function diffResults(a: unknown, b: unknown): Difference[] {
  return diffDocuments(a, b, { dropArrays: true, skip: ['balance.effectiveVehicle', 'balance.caution', 'balance.sensitivity', 'balance.comparison'] });
}

export class ConfigurationCompute {
  constructor(
    private readonly orm: Orm,
    private readonly store: ConfigurationStore,
    private readonly pool: ComputePool,
    private readonly computeTimeLimitMs: number,
  ) {}

  /** The documents of one revision (default: the current one) of `c`, the configuration as loaded for its team. */
  async inputs(c: { id: string; revision: number }, revision?: number): Promise<{ revision: number; refs: ConfigurationRefs; inputs: ConfigurationInputs }> {
    const r = await this.store.revisionRow(c.id, revision ?? c.revision);
    const [v] = await this.orm
      .select({ data: vehicleRevisions.data })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, r.vehicleId), eq(vehicleRevisions.revision, r.vehicleRevision)));
    const corner = async (designId: string, rev: number) => {
      const [d] = await this.orm
        .select({ corner: axleDesignRevisions.corner })
        .from(axleDesignRevisions)
        .where(and(eq(axleDesignRevisions.designId, designId), eq(axleDesignRevisions.revision, rev)));
      if (!d) throw notFound('Axle design revision');
      return storedCorner(d.corner);
    };
    const refs: ConfigurationRefs = {
      vehicleId: r.vehicleId,
      vehicleRevision: r.vehicleRevision,
      frontDesignId: r.frontDesignId,
      frontDesignRevision: r.frontDesignRevision,
      rearDesignId: r.rearDesignId,
      rearDesignRevision: r.rearDesignRevision,
      trackProfile: r.trackProfile,
    };
    return {
      revision: r.revision,
      refs,
      inputs: {
        vehicle: v?.data === null || v === undefined ? null : upgradeVehicleDocument(v.data),
        frontCorner: await corner(r.frontDesignId, r.frontDesignRevision),
        rearCorner: await corner(r.rearDesignId, r.rearDesignRevision),
        trackProfile: refs.trackProfile,
      },
    };
  }

  /** Runs the shared engines on the inputs (shared/configuration/analyse.ts: balance with both corners linked; each corner over the profile's travel). */
  async compute(inputs: ConfigurationInputs): Promise<ConfigurationResults> {
    const r = configurationRequests(inputs);
    // The pool answers `unknown` across the thread boundary: 'balance' answers a BalanceResponse, 'corner-sweep' a SweepResult (compute/tasks.ts).
    const run = (kind: 'balance' | 'corner-sweep', input: unknown) => this.pool.run(kind, input, { timeLimitMs: this.computeTimeLimitMs });
    const [balance, front, rear] = await Promise.all([run('balance', r.balance), run('corner-sweep', r.front), run('corner-sweep', r.rear)]);
    return configurationAnalysis(r, balance as BalanceResponse, front as SweepResult, rear as SweepResult);
  }

  async results(c: { id: string; revision: number }, revision?: number) {
    const { revision: rev, refs, inputs } = await this.inputs(c, revision);
    return { revision: rev, refs, engineVersion: ENGINE_VERSION, results: await this.compute(inputs) };
  }

  /** Changed inputs and changed key results of two configuration revisions, side by side. */
  async compare(teamId: string, a: { id: string; revision?: number | undefined }, b: { id: string; revision?: number | undefined }) {
    const of = async (x: { id: string; revision?: number | undefined }) => this.inputs(await this.store.get(teamId, x.id), x.revision);
    const [ia, ib] = await Promise.all([of(a), of(b)]);
    const [ra, rb] = await Promise.all([this.compute(ia.inputs), this.compute(ib.inputs)]);
    return {
      engineVersion: ENGINE_VERSION,
      a: { configurationId: a.id, revision: ia.revision, refs: ia.refs },
      b: { configurationId: b.id, revision: ib.revision, refs: ib.refs },
      inputs: diffDocuments(ia.inputs, ib.inputs, { expandArrays: true }),
      results: diffResults(ra, rb),
    };
  }
}
