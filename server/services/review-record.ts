/**
 * The configuration review record: everything a team files about one
 * configuration revision, in one answer. Both axles' inputs, toe and camber
 * curves over the track profile's travel, the understeer budget, the bump
 * cost, the cautions and what reviewers acknowledged, the rig evidence and
 * waivers, who decided what and when, and the fingerprint of each approval
 * snapshot (SHA-256 of its frozen inputs, results and engine version, so a
 * filed copy can be checked against the database). Computed now; nothing is
 * stored.
 */
import { createHash } from 'node:crypto';
import { and, asc, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { configurationApprovals, configurationRevisions, teams, users } from '../db/schema.js';
import { notFound } from '../../shared/errors.js';
import type { ComputePool } from '../compute/pool.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { SAFETY_CAUTION } from '../../shared/cautions/cautions.js';
import { trackProfiles } from '../../shared/tracks/profiles.js';
import type { Configurations, ConfigurationView } from './configurations.js';
import { ReviewGates } from './review-gates.js';
import type { DisplayUnits } from '../../shared/api/accounts.js';

/** JSON with object keys sorted at every level: jsonb does not keep key order, the fingerprint must not depend on it. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value) ?? 'null';
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const o = value as Record<string, unknown>;
  return `{${Object.keys(o)
    .filter((k) => o[k] !== undefined)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`)
    .join(',')}}`;
}

/** SHA-256 (hex) of an approval snapshot: configuration, revision, engine version, frozen inputs and results. */
export function snapshotFingerprint(a: { configurationId: string; revision: number; engineVersion: string; inputs: unknown; results: unknown }): string {
  return createHash('sha256')
    .update(canonicalJson({ configurationId: a.configurationId, revision: a.revision, engineVersion: a.engineVersion, inputs: a.inputs, results: a.results }))
    .digest('hex');
}

export interface CurvePoint {
  travelMm: number;
  toeDeg: number;
  camberDeg: number;
}

export class ReviewRecord {
  private readonly gates: ReviewGates;

  constructor(
    private readonly orm: Orm,
    private readonly configs: Configurations,
    private readonly pool: ComputePool,
    private readonly computeTimeLimitMs: number,
  ) {
    this.gates = new ReviewGates(orm, configs, pool, computeTimeLimitMs);
  }

  /** Toe and camber against travel, rack straight ahead, over the profile's travel range (41 points). */
  private async curve(corner: unknown, travelMm: readonly [number, number]): Promise<CurvePoint[]> {
    const [from, to] = travelMm;
    const sweep = (await this.pool.run('corner-sweep', { corner, travel: { from, to, step: (to - from) / 40 } }, { timeLimitMs: this.computeTimeLimitMs })) as {
      rows: { rackMm: number; travelMm: number; toeDeg: number; camberDeg: number }[];
    };
    return sweep.rows.filter((r) => r.rackMm === 0).map((r) => ({ travelMm: r.travelMm, toeDeg: r.toeDeg, camberDeg: r.camberDeg }));
  }

  /**
   * `configuration`: as loaded for its team (routes/loaders.ts). `units`: the unit system the cautions'
   * messages write their figures in (the reader's, for the page and the PDF); every value stays SI.
   */
  async record(teamId: string, configuration: ConfigurationView, revision?: number, units: DisplayUnits = 'si') {
    const id = configuration.id;
    const { revision: rev, refs, inputs } = await this.configs.inputs(configuration, revision);
    const profile = trackProfiles[refs.trackProfile];
    const [team] = await this.orm.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
    if (!team) throw notFound('Team');
    const [revisionRow] = await this.orm
      .select({ message: configurationRevisions.message, authorName: users.displayName, createdAt: configurationRevisions.createdAt })
      .from(configurationRevisions)
      .leftJoin(users, eq(users.id, configurationRevisions.authorId))
      .where(and(eq(configurationRevisions.configurationId, id), eq(configurationRevisions.revision, rev)));
    const [results, cautions, front, rear, evidence, tolerance, records, transitions, approvalRows] = await Promise.all([
      this.configs.compute(inputs),
      this.gates.cautions(inputs, units),
      this.curve(inputs.frontCorner, profile.travelMm),
      this.curve(inputs.rearCorner, profile.travelMm),
      this.gates.evidence(teamId, refs),
      this.gates.rigTolerance(teamId),
      this.gates.records(id),
      this.configs.history({ id }),
      this.orm
        .select({
          id: configurationApprovals.id,
          revision: configurationApprovals.revision,
          engineVersion: configurationApprovals.engineVersion,
          inputs: configurationApprovals.inputs,
          results: configurationApprovals.results,
          message: configurationApprovals.message,
          approvedByName: users.displayName,
          approvedAt: configurationApprovals.approvedAt,
        })
        .from(configurationApprovals)
        .leftJoin(users, eq(users.id, configurationApprovals.approvedBy))
        .where(eq(configurationApprovals.configurationId, id))
        .orderBy(asc(configurationApprovals.approvedAt)),
    ]);
    const approvals = approvalRows.map((a) => ({
      id: a.id,
      revision: a.revision,
      engineVersion: a.engineVersion,
      message: a.message,
      approvedByName: a.approvedByName,
      approvedAt: a.approvedAt,
      fingerprint: snapshotFingerprint({ configurationId: id, revision: a.revision, engineVersion: a.engineVersion, inputs: a.inputs, results: a.results }),
    }));
    return {
      generatedAt: new Date(),
      engineVersion: ENGINE_VERSION,
      team: { name: team.name },
      configuration: { id, name: configuration.name, status: configuration.status, currentRevision: configuration.revision, archived: configuration.archived },
      revision: { number: rev, message: revisionRow?.message ?? null, authorName: revisionRow?.authorName ?? null, createdAt: revisionRow?.createdAt ?? null },
      refs: {
        vehicle: { id: refs.vehicleId, name: configuration.vehicle.id === refs.vehicleId ? configuration.vehicle.name : null, revision: refs.vehicleRevision },
        front: { designId: refs.frontDesignId, name: configuration.front.designId === refs.frontDesignId ? configuration.front.name : null, revision: refs.frontDesignRevision },
        rear: { designId: refs.rearDesignId, name: configuration.rear.designId === refs.rearDesignId ? configuration.rear.name : null, revision: refs.rearDesignRevision },
      },
      trackProfile: { id: profile.id, label: profile.label, travelMm: profile.travelMm },
      inputs: { vehicle: inputs.vehicle, frontCorner: inputs.frontCorner, rearCorner: inputs.rearCorner },
      results,
      curves: { front, rear },
      cautions,
      acknowledgements: records.acknowledgements,
      waivers: records.waivers,
      rig: { tolerance, axles: evidence },
      history: transitions,
      approvals,
      /** The approval of the recorded revision, latest first, or null. */
      approval: [...approvals].reverse().find((a) => a.revision === rev) ?? null,
      safetyNotice: SAFETY_CAUTION,
    };
  }

}

export type ReviewRecordAnswer = Awaited<ReturnType<ReviewRecord['record']>>;
