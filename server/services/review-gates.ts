/**
 * The gates of a sign-off (docs/workflow.md, "Gates"):
 *
 * - **Sign-off** (in review → approved) with a Critical caution on either
 *   axle needs the reviewer's written reason for each one. The cautions are
 *   measured here, on the server, by the same shared code the configuration
 *   screen runs (shared/cautions/configuration-cautions.ts); an axle whose
 *   cautions cannot be measured at all counts as one Critical item.
 * - **Validated** (released → validated) needs, for each axle, a rig
 *   measurement of the axle design revision the configuration uses whose
 *   comparison stays within the team's rig tolerance, or a recorded waiver
 *   with a reason.
 *
 * What the reviewer gave (acknowledgements, waivers) is stored in the same
 * transaction as the status change, tied to that transition.
 */
import { asc, eq } from 'drizzle-orm';
import type { Executor, Orm } from '../db/client.js';
import { cautionAcknowledgements, rigEvidenceWaivers, users } from '../db/schema.js';
import { DomainError, InputError } from '../../shared/errors.js';
import type { AxleName } from '../../shared/schema/axle.js';
import type { ComputePool } from '../compute/pool.js';
import type { AxleCautionList, ConfigurationCautionsInput } from '../../shared/cautions/configuration-cautions.js';
import type { DisplayUnits } from '../../shared/api/accounts.js';
import type { ConfigurationInputs, ConfigurationRefs, ConfigurationView, Configurations, ReviewAction } from './configurations.js';
import { RigMeasurements } from './rig-measurements.js';
import type { AxleEvidence as AxleEvidenceWire, CriticalCaution, RigEvidence as RigEvidenceWire } from '../../shared/api/configurations.js';

export interface CautionAcknowledgementInput {
  axle: AxleName;
  code: string;
  reason: string;
}
export interface RigWaiverInput {
  axle: AxleName;
  reason: string;
}
/** What a reviewer may send with a decision: acknowledgements with a sign-off, waivers with a move to validated. */
export interface GateInput {
  acknowledgements?: CautionAcknowledgementInput[] | undefined;
  waivers?: RigWaiverInput[] | undefined;
}

/** Code of the item standing for an axle whose cautions could not be measured. */
export const CAUTIONS_UNMEASURED = 'cautions-unmeasured';

/** A rig measurement as evidence (`createdAt` still a Date; the record also shows what it is attached to, its side and basis). */
export type RigEvidence = Omit<RigEvidenceWire, 'createdAt'> & { createdAt: Date; attachedTo: string; side: string; basis: string };
/** One axle's rig evidence. */
export type AxleEvidence = Omit<AxleEvidenceWire, 'measurements'> & { designId: string; measurements: RigEvidence[] };

/** Runs after the status row is written, inside its transaction. */
export interface GatePass {
  record(tx: Executor, transitionId: string, actorId: string): Promise<void>;
}

const NOTHING: GatePass = { record: async () => {} };
const AXLE_WORDS: Record<AxleName, string> = { front: 'Front axle', rear: 'Rear axle' };
/** Measurements looked at per axle (newest first): each is compared again with the current engine. */
const EVIDENCE_LIMIT = 12;

export class ReviewGates {
  private readonly rig: RigMeasurements;

  constructor(
    private readonly orm: Orm,
    private readonly configs: Configurations,
    private readonly pool: ComputePool,
    private readonly computeTimeLimitMs: number,
  ) {
    this.rig = new RigMeasurements(orm, configs, pool, computeTimeLimitMs);
  }

  /** Both axles' cautions on the configuration's track profile (server-side, the shared measurement). */
  async cautions(inputs: ConfigurationInputs, units: DisplayUnits = 'si'): Promise<AxleCautionList[]> {
    const input: ConfigurationCautionsInput = { ...inputs, units };
    return (await this.pool.run('configuration-cautions', input, { timeLimitMs: this.computeTimeLimitMs })) as AxleCautionList[];
  }

  /** The Critical items of both axles: each Critical caution, and each axle whose cautions could not be measured. */
  static critical(lists: readonly AxleCautionList[]): CriticalCaution[] {
    const out: CriticalCaution[] = [];
    for (const l of lists) {
      if (!l.ok) {
        out.push({ axle: l.axle, code: CAUTIONS_UNMEASURED, message: `The cautions could not be measured: ${l.failure.message}`, value: null, threshold: null, unit: null });
        continue;
      }
      for (const c of l.cautions) {
        if (c.level === 'critical') out.push({ axle: l.axle, code: c.code, message: c.message, value: c.value ?? null, threshold: c.threshold ?? null, unit: c.unit ?? null });
      }
    }
    return out;
  }

  /** Rig measurements of the design revisions a configuration revision uses, each compared now with the team's tolerance. */
  async evidence(teamId: string, refs: ConfigurationRefs): Promise<AxleEvidence[]> {
    const out: AxleEvidence[] = [];
    for (const axle of ['front', 'rear'] as const) {
      const designId = axle === 'front' ? refs.frontDesignId : refs.rearDesignId;
      const designRevision = axle === 'front' ? refs.frontDesignRevision : refs.rearDesignRevision;
      const rows = (await this.rig.list(teamId, { designId })).filter((m) => m.designRevision === designRevision).slice(0, EVIDENCE_LIMIT);
      const measurements: RigEvidence[] = [];
      for (const row of rows) {
        const m = await this.rig.get(teamId, row);
        const disagreeing = m.comparison.cautions.some((c) => c.code === 'rig-toe-disagreement' || c.code === 'rig-camber-disagreement');
        measurements.push({
          id: m.id,
          name: m.name,
          attachedTo: m.attachedTo,
          side: m.side,
          basis: m.basis,
          authorName: m.authorName ?? null,
          createdAt: m.createdAt,
          toeLargestDeg: m.comparison.toe.largestDeg,
          camberLargestDeg: m.comparison.camber ? m.comparison.camber.largestDeg : null,
          within: !disagreeing,
        });
      }
      out.push({ axle, designId, designRevision, measurements, satisfied: measurements.some((m) => m.within) });
    }
    return out;
  }

  rigTolerance(teamId: string) {
    return this.rig.tolerance(teamId);
  }

  /** What a configuration revision's gates ask for now (the sign-off dialog and the validate step show it). */
  async status(teamId: string, c: { id: string; revision: number }, revision?: number) {
    const { revision: rev, refs, inputs } = await this.configs.inputs(c, revision);
    // One after another: the seed runs this inside a transaction (one connection).
    const lists = await this.cautions(inputs);
    const evidence = await this.evidence(teamId, refs);
    const tolerance = await this.rig.tolerance(teamId);
    const records = await this.records(c.id);
    return {
      revision: rev,
      critical: ReviewGates.critical(lists),
      rig: { tolerance: { toeDeg: tolerance.toeDeg, camberDeg: tolerance.camberDeg, isDefault: tolerance.isDefault }, axles: evidence },
      acknowledgements: records.acknowledgements.filter((a) => a.revision === rev),
      waivers: records.waivers.filter((w) => w.revision === rev),
    };
  }

  /** Every acknowledgement and waiver of a configuration, oldest first, with who gave it. */
  async records(id: string) {
    const acknowledgements = await this.orm
      .select({
        id: cautionAcknowledgements.id,
        revision: cautionAcknowledgements.revision,
        transitionId: cautionAcknowledgements.transitionId,
        axle: cautionAcknowledgements.axle,
        code: cautionAcknowledgements.code,
        message: cautionAcknowledgements.message,
        value: cautionAcknowledgements.value,
        threshold: cautionAcknowledgements.threshold,
        unit: cautionAcknowledgements.unit,
        reason: cautionAcknowledgements.reason,
        acknowledgedByName: users.displayName,
        acknowledgedAt: cautionAcknowledgements.acknowledgedAt,
      })
      .from(cautionAcknowledgements)
      .leftJoin(users, eq(users.id, cautionAcknowledgements.acknowledgedBy))
      .where(eq(cautionAcknowledgements.configurationId, id))
      .orderBy(asc(cautionAcknowledgements.acknowledgedAt), asc(cautionAcknowledgements.axle), asc(cautionAcknowledgements.code));
    const waivers = await this.orm
      .select({
        id: rigEvidenceWaivers.id,
        revision: rigEvidenceWaivers.revision,
        transitionId: rigEvidenceWaivers.transitionId,
        axle: rigEvidenceWaivers.axle,
        reason: rigEvidenceWaivers.reason,
        waivedByName: users.displayName,
        waivedAt: rigEvidenceWaivers.waivedAt,
      })
      .from(rigEvidenceWaivers)
      .leftJoin(users, eq(users.id, rigEvidenceWaivers.waivedBy))
      .where(eq(rigEvidenceWaivers.configurationId, id))
      .orderBy(asc(rigEvidenceWaivers.waivedAt), asc(rigEvidenceWaivers.axle));
    return { acknowledgements, waivers };
  }

  /**
   * Checks the gate of a decision before its transaction; throws a 409 in the
   * user's words naming what is missing. The returned pass stores what the
   * reviewer gave, inside the transition's transaction.
   */
  async check(teamId: string, before: ConfigurationView, action: ReviewAction, input: GateInput | undefined): Promise<GatePass> {
    if (action === 'approve') return this.checkSignOff(teamId, before, input?.acknowledgements ?? []);
    if (action === 'validate') return this.checkValidation(teamId, before, input?.waivers ?? []);
    return NOTHING;
  }

  private async checkSignOff(teamId: string, before: ConfigurationView, given: CautionAcknowledgementInput[]): Promise<GatePass> {
    const { inputs } = await this.configs.inputs(before, before.revision);
    const critical = ReviewGates.critical(await this.cautions(inputs));
    const key = (x: { axle: AxleName; code: string }) => `${x.axle}:${x.code}`;
    const byKey = new Map(critical.map((c) => [key(c), c]));
    const seen = new Set<string>();
    const fields: { path: string; message: string }[] = [];
    given.forEach((a, i) => {
      if (seen.has(key(a))) fields.push({ path: `acknowledgements[${i}]`, message: `${AXLE_WORDS[a.axle]} caution "${a.code}" is acknowledged twice` });
      else if (!byKey.has(key(a))) fields.push({ path: `acknowledgements[${i}]`, message: `${AXLE_WORDS[a.axle]} has no Critical caution "${a.code}" on revision ${before.revision}` });
      seen.add(key(a));
    });
    if (fields.length) throw new InputError(`Acknowledgements that match no Critical caution: ${fields.map((f) => f.message).join('; ')}`, fields);
    const missing = critical.filter((c) => !seen.has(key(c)));
    if (missing.length) {
      throw new DomainError(
        'conflict',
        'cautions_unacknowledged',
        `Signing off needs a written reason for every Critical caution. Not yet acknowledged: ${missing.map((c) => `${AXLE_WORDS[c.axle].toLowerCase()}: ${c.message}`).join('; ')}`,
        { unacknowledged: missing },
      );
    }
    return {
      record: async (tx, transitionId, actorId) => {
        if (!given.length) return;
        await tx.insert(cautionAcknowledgements).values(
          given.map((a) => {
            const c = byKey.get(key(a))!;
            return { configurationId: before.id, revision: before.revision, transitionId, axle: a.axle, code: a.code, message: c.message, value: c.value, threshold: c.threshold, unit: c.unit, reason: a.reason, acknowledgedBy: actorId };
          }),
        );
      },
    };
  }

  private async checkValidation(teamId: string, before: ConfigurationView, waivers: RigWaiverInput[]): Promise<GatePass> {
    const { refs } = await this.configs.inputs(before, before.revision);
    const [evidence, tolerance] = await Promise.all([this.evidence(teamId, refs), this.rig.tolerance(teamId)]);
    const twice = waivers.findIndex((w, i) => waivers.findIndex((x) => x.axle === w.axle) !== i);
    if (twice >= 0) {
      throw new InputError(`${AXLE_WORDS[waivers[twice]!.axle]} is waived twice`, [{ path: `waivers[${twice}]`, message: 'this axle is waived twice' }]);
    }
    const missing = evidence.filter((e) => !e.satisfied && !waivers.some((w) => w.axle === e.axle));
    if (missing.length) {
      const within = `within the team's rig tolerance (toe ${tolerance.toeDeg}°, camber ${tolerance.camberDeg}°)`;
      const what = missing.map((e) =>
        e.measurements.length
          ? `${AXLE_WORDS[e.axle].toLowerCase()} (${e.measurements.length} measurement${e.measurements.length === 1 ? '' : 's'} of design revision ${e.designRevision}, none ${within})`
          : `${AXLE_WORDS[e.axle].toLowerCase()} (no rig measurement of design revision ${e.designRevision})`,
      );
      throw new DomainError('conflict', 'rig_evidence_missing', `Marking as validated needs rig evidence ${within} for each axle, or a recorded waiver with a reason. Missing: ${what.join('; ')}`, {
        axles: missing.map((e) => ({ axle: e.axle, designId: e.designId, designRevision: e.designRevision, measurements: e.measurements.length })),
        tolerance: { toeDeg: tolerance.toeDeg, camberDeg: tolerance.camberDeg },
      });
    }
    return {
      record: async (tx, transitionId, actorId) => {
        if (!waivers.length) return;
        await tx
          .insert(rigEvidenceWaivers)
          .values(waivers.map((w) => ({ configurationId: before.id, revision: before.revision, transitionId, axle: w.axle, reason: w.reason, waivedBy: actorId })));
      },
    };
  }
}
