/**
 * Configurations: one vehicle revision + one front and one rear axle design
 * revision + a track profile, the unit of review. The state machine:
 *
 *   draft ──submit──▶ in_review ──approve──▶ approved ──release──▶ released ──validate──▶ validated
 *     ▲                 │  └──request-changes──▶ changes_requested
 *     └────withdraw─────┘
 *
 * Any new revision (other references, name, track profile) returns the
 * configuration to draft. Decisions (approve, request changes, release,
 * validate) are the reviewer's, and never on a configuration any revision of
 * whose current review round — or any vehicle / axle design revision it
 * references — the reviewer authored. Approval freezes inputs, computed results and the
 * engine version. Results come from the shared engines through the compute
 * pool; nothing here does engineering math.
 */
import { and, asc, desc, eq, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Executor, Orm } from '../db/client.js';
import {
  axleDesignRevisions,
  axleDesigns,
  configurationApprovals,
  configurationRevisions,
  configurations,
  configurationTransitions,
  memberships,
  reviewComments,
  teams,
  users,
  vehicleRevisions,
  vehicles,
  type ConfigurationStatus,
} from '../db/schema.js';
import { HttpError, notFound } from '../http/errors.js';
import { hasPermission, type Permission, type Role } from '../permissions.js';
import type { ComputePool } from '../compute/pool.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { trackProfiles, type TrackProfileId } from '../../shared/intent/profiles.js';
import { upgradeCornerDocument } from '../../shared/schema/corner.js';
import { upgradeVehicleDocument } from '../../shared/schema/vehicle.js';
import { staleRevision } from './revisions.js';
import { enqueueMail, type OutgoingMail } from '../mail/outbox.js';
import { mailText } from '../mail/messages.js';
import { diffDocuments, type Difference } from './document-diff.js';
import { recordActivity } from './activity.js';

export type ReviewAction = 'submit' | 'withdraw' | 'approve' | 'request-changes' | 'release' | 'validate';
export const REVIEW_ACTIONS: readonly ReviewAction[] = ['submit', 'withdraw', 'approve', 'request-changes', 'release', 'validate'];

/** The transition table: from which status, to which, needing which permission; decisions are never on one's own work. */
export const TRANSITIONS: Readonly<Record<ReviewAction, { from: readonly ConfigurationStatus[]; to: ConfigurationStatus; permission: Permission; decision: boolean }>> = {
  submit: { from: ['draft'], to: 'in_review', permission: 'review:submit', decision: false },
  withdraw: { from: ['in_review'], to: 'draft', permission: 'review:submit', decision: false },
  approve: { from: ['in_review'], to: 'approved', permission: 'review:decide', decision: true },
  'request-changes': { from: ['in_review'], to: 'changes_requested', permission: 'review:decide', decision: true },
  release: { from: ['approved'], to: 'released', permission: 'review:decide', decision: true },
  validate: { from: ['released'], to: 'validated', permission: 'review:decide', decision: true },
};

export interface ConfigurationRefs {
  vehicleId: string;
  vehicleRevision: number;
  frontDesignId: string;
  frontDesignRevision: number;
  rearDesignId: string;
  rearDesignRevision: number;
  trackProfile: TrackProfileId;
}

/** The documents a configuration revision stands for. */
export interface ConfigurationInputs {
  vehicle: unknown;
  frontCorner: unknown;
  rearCorner: unknown;
  trackProfile: TrackProfileId;
}

export interface ConfigurationResults {
  /** The balance engine's answer for the vehicle with both corners linked. */
  balance: unknown;
  /** Toe / camber fits of each corner over the track profile's travel range. */
  bumpSteer: { front: unknown; rear: unknown; travelMm: [number, number] };
}

const updater = alias(users, 'updater');
const vehicleRef = alias(vehicles, 'vehicle_ref');
const frontRef = alias(axleDesigns, 'front_ref');
const rearRef = alias(axleDesigns, 'rear_ref');

const viewColumns = {
  id: configurations.id,
  name: configurations.name,
  status: configurations.status,
  revision: configurations.revision,
  archived: configurations.archived,
  vehicleId: configurations.vehicleId,
  vehicleName: vehicleRef.name,
  vehicleRevision: configurations.vehicleRevision,
  frontDesignId: configurations.frontDesignId,
  frontDesignName: frontRef.name,
  frontDesignRevision: configurations.frontDesignRevision,
  rearDesignId: configurations.rearDesignId,
  rearDesignName: rearRef.name,
  rearDesignRevision: configurations.rearDesignRevision,
  trackProfile: configurations.trackProfile,
  updatedAt: configurations.updatedAt,
  updatedByName: updater.displayName,
  createdAt: configurations.createdAt,
};

export type ConfigurationView = {
  id: string;
  name: string;
  status: ConfigurationStatus;
  revision: number;
  archived: boolean;
  vehicle: { id: string; name: string; revision: number };
  front: { designId: string; name: string; revision: number };
  rear: { designId: string; name: string; revision: number };
  trackProfile: string;
  updatedAt: Date;
  updatedByName: string | null;
  createdAt: Date;
};

type Row = { [K in keyof typeof viewColumns]: unknown } & Record<string, unknown>;

function toView(r: Row): ConfigurationView {
  return {
    id: r.id as string,
    name: r.name as string,
    status: r.status as ConfigurationStatus,
    revision: r.revision as number,
    archived: r.archived as boolean,
    vehicle: { id: r.vehicleId as string, name: r.vehicleName as string, revision: r.vehicleRevision as number },
    front: { designId: r.frontDesignId as string, name: r.frontDesignName as string, revision: r.frontDesignRevision as number },
    rear: { designId: r.rearDesignId as string, name: r.rearDesignName as string, revision: r.rearDesignRevision as number },
    trackProfile: r.trackProfile as string,
    updatedAt: r.updatedAt as Date,
    updatedByName: (r.updatedByName as string | null) ?? null,
    createdAt: r.createdAt as Date,
  };
}

const invalidTransition = (action: ReviewAction, status: ConfigurationStatus) =>
  new HttpError(409, 'invalid_transition', `A configuration that is ${status.replace('_', ' ')} cannot be sent to "${action}"`, {
    action,
    status,
    allowedFrom: TRANSITIONS[action].from,
  });

export interface RefsInput {
  vehicleId: string;
  vehicleRevision?: number | undefined;
  frontDesignId: string;
  frontDesignRevision?: number | undefined;
  rearDesignId: string;
  rearDesignRevision?: number | undefined;
  trackProfile: TrackProfileId;
}

export class Configurations {
  constructor(
    private readonly orm: Orm,
    private readonly pool: ComputePool,
    private readonly computeTimeLimitMs: number,
    private readonly publicUrl: string,
  ) {}

  private select(orm: Executor) {
    return orm
      .select(viewColumns)
      .from(configurations)
      .innerJoin(vehicleRef, eq(vehicleRef.id, configurations.vehicleId))
      .innerJoin(frontRef, eq(frontRef.id, configurations.frontDesignId))
      .innerJoin(rearRef, eq(rearRef.id, configurations.rearDesignId))
      .leftJoin(updater, eq(updater.id, configurations.updatedBy));
  }

  async list(teamId: string, includeArchived: boolean): Promise<ConfigurationView[]> {
    const where = includeArchived ? eq(configurations.teamId, teamId) : and(eq(configurations.teamId, teamId), eq(configurations.archived, false));
    const rows = await this.select(this.orm).where(where).orderBy(asc(configurations.name));
    return rows.map((r) => toView(r as Row));
  }

  async get(teamId: string, id: string, orm: Executor = this.orm): Promise<ConfigurationView> {
    const [r] = await this.select(orm).where(and(eq(configurations.id, id), eq(configurations.teamId, teamId)));
    if (!r) throw notFound('Configuration');
    return toView(r as Row);
  }

  /** Checks the references belong to this team and vehicle, sit on the right axles and exist; fills missing revisions with the current ones. */
  private async resolveRefs(teamId: string, input: RefsInput, orm: Executor = this.orm): Promise<ConfigurationRefs> {
    const [v] = await orm.select({ id: vehicles.id, revision: vehicles.revision }).from(vehicles).where(and(eq(vehicles.id, input.vehicleId), eq(vehicles.teamId, teamId)));
    if (!v) throw new HttpError(404, 'not_found', 'Vehicle not found', { field: 'vehicleId' });
    const vehicleRevision = input.vehicleRevision ?? v.revision;
    const [vr] = await orm
      .select({ data: vehicleRevisions.data })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, v.id), eq(vehicleRevisions.revision, vehicleRevision)));
    if (!vr) throw new HttpError(404, 'not_found', `Vehicle revision ${vehicleRevision} not found`, { field: 'vehicleRevision' });
    if (vr.data === null) {
      throw new HttpError(409, 'incomplete_configuration', `Vehicle revision ${vehicleRevision} has no vehicle data yet; enter the balance model data first`, {
        field: 'vehicleRevision',
      });
    }
    const design = async (axle: 'front' | 'rear', id: string, revision: number | undefined) => {
      const [d] = await orm
        .select({ id: axleDesigns.id, axle: axleDesigns.axle, revision: axleDesigns.revision })
        .from(axleDesigns)
        .where(and(eq(axleDesigns.id, id), eq(axleDesigns.vehicleId, v.id)));
      const field = `${axle}DesignId`;
      if (!d) throw new HttpError(404, 'not_found', `The ${axle} axle design is not one of this vehicle's`, { field });
      if (d.axle !== axle) throw new HttpError(400, 'invalid_input', `That design is a ${d.axle} axle design`, { fields: [{ path: field, message: `is a ${d.axle} axle design` }] });
      const rev = revision ?? d.revision;
      const [dr] = await orm
        .select({ revision: axleDesignRevisions.revision })
        .from(axleDesignRevisions)
        .where(and(eq(axleDesignRevisions.designId, id), eq(axleDesignRevisions.revision, rev)));
      if (!dr) throw new HttpError(404, 'not_found', `${axle} design revision ${rev} not found`, { field: `${axle}DesignRevision` });
      return rev;
    };
    return {
      vehicleId: v.id,
      vehicleRevision,
      frontDesignId: input.frontDesignId,
      frontDesignRevision: await design('front', input.frontDesignId, input.frontDesignRevision),
      rearDesignId: input.rearDesignId,
      rearDesignRevision: await design('rear', input.rearDesignId, input.rearDesignRevision),
      trackProfile: input.trackProfile,
    };
  }

  async create(teamId: string, authorId: string, input: RefsInput & { name: string; message?: string | undefined }): Promise<ConfigurationView> {
    return this.orm.transaction(async (tx) => {
      const refs = await this.resolveRefs(teamId, input, tx);
      const [c] = await tx
        .insert(configurations)
        .values({ teamId, name: input.name, ...refs, updatedBy: authorId })
        .returning({ id: configurations.id });
      await tx.insert(configurationRevisions).values({ configurationId: c!.id, revision: 1, name: input.name, ...refs, message: input.message ?? 'Created', authorId });
      await recordActivity(tx, { teamId, actorId: authorId, action: 'configuration.create', subjectType: 'configuration', subjectId: c!.id, summary: `Created configuration "${input.name}"` });
      return this.get(teamId, c!.id, tx);
    });
  }

  /** A new revision (other references, name or track profile); always back to draft. */
  async revise(
    teamId: string,
    id: string,
    authorId: string,
    baseRevision: number,
    change: Partial<RefsInput> & { name?: string | undefined; message?: string | undefined },
  ): Promise<ConfigurationView> {
    const current = await this.get(teamId, id);
    return this.orm.transaction(async (tx) => {
      // The status this revision replaces, read under the row lock: a review decision may have landed since `current` was read.
      const [locked] = await tx
        .select({ status: configurations.status })
        .from(configurations)
        .where(and(eq(configurations.id, id), eq(configurations.revision, baseRevision)))
        .for('update');
      if (!locked) throw staleRevision(baseRevision, await this.get(teamId, id, tx));
      const refs = await this.resolveRefs(
        teamId,
        {
          vehicleId: change.vehicleId ?? current.vehicle.id,
          // A changed vehicle or design without a revision means its current revision.
          vehicleRevision: change.vehicleRevision ?? (change.vehicleId ? undefined : current.vehicle.revision),
          frontDesignId: change.frontDesignId ?? current.front.designId,
          frontDesignRevision: change.frontDesignRevision ?? (change.frontDesignId ? undefined : current.front.revision),
          rearDesignId: change.rearDesignId ?? current.rear.designId,
          rearDesignRevision: change.rearDesignRevision ?? (change.rearDesignId ? undefined : current.rear.revision),
          trackProfile: change.trackProfile ?? (current.trackProfile as TrackProfileId),
        },
        tx,
      );
      const name = change.name ?? current.name;
      const [row] = await tx
        .update(configurations)
        .set({ ...refs, name, status: 'draft', revision: sql`${configurations.revision} + 1`, updatedAt: sql`now()`, updatedBy: authorId })
        .where(and(eq(configurations.id, id), eq(configurations.revision, baseRevision)))
        .returning({ revision: configurations.revision, status: configurations.status });
      if (!row) throw staleRevision(baseRevision, await this.get(teamId, id, tx));
      await tx.insert(configurationRevisions).values({ configurationId: id, revision: row.revision, name, ...refs, message: change.message ?? null, authorId });
      await recordActivity(tx, {
        teamId,
        actorId: authorId,
        action: 'configuration.revise',
        subjectType: 'configuration',
        subjectId: id,
        summary: `Configuration "${name}" revision ${row.revision}${change.message ? ` (${change.message})` : ''}`,
      });
      if (locked.status !== 'draft') {
        await tx.insert(configurationTransitions).values({
          configurationId: id,
          revision: row.revision,
          fromStatus: locked.status,
          toStatus: 'draft',
          message: `New revision ${row.revision}`,
          actorId: authorId,
        });
      }
      return this.get(teamId, id, tx);
    });
  }

  /** Archive or restore (configurations are never deleted). */
  async setArchived(teamId: string, id: string, userId: string, archived: boolean): Promise<ConfigurationView> {
    await this.get(teamId, id);
    await this.orm.update(configurations).set({ archived, updatedAt: sql`now()`, updatedBy: userId }).where(eq(configurations.id, id));
    return this.get(teamId, id);
  }

  async revisions(teamId: string, id: string) {
    await this.get(teamId, id);
    return this.orm
      .select({
        revision: configurationRevisions.revision,
        name: configurationRevisions.name,
        vehicleId: configurationRevisions.vehicleId,
        vehicleRevision: configurationRevisions.vehicleRevision,
        frontDesignId: configurationRevisions.frontDesignId,
        frontDesignRevision: configurationRevisions.frontDesignRevision,
        rearDesignId: configurationRevisions.rearDesignId,
        rearDesignRevision: configurationRevisions.rearDesignRevision,
        trackProfile: configurationRevisions.trackProfile,
        message: configurationRevisions.message,
        authorName: users.displayName,
        createdAt: configurationRevisions.createdAt,
      })
      .from(configurationRevisions)
      .leftJoin(users, eq(users.id, configurationRevisions.authorId))
      .where(eq(configurationRevisions.configurationId, id))
      .orderBy(desc(configurationRevisions.revision));
  }

  async history(teamId: string, id: string) {
    await this.get(teamId, id);
    return this.orm
      .select({
        revision: configurationTransitions.revision,
        fromStatus: configurationTransitions.fromStatus,
        toStatus: configurationTransitions.toStatus,
        message: configurationTransitions.message,
        actorName: users.displayName,
        createdAt: configurationTransitions.createdAt,
      })
      .from(configurationTransitions)
      .leftJoin(users, eq(users.id, configurationTransitions.actorId))
      .where(eq(configurationTransitions.configurationId, id))
      .orderBy(asc(configurationTransitions.createdAt));
  }

  private async revisionRow(id: string, revision: number, orm: Executor = this.orm) {
    const [r] = await orm
      .select()
      .from(configurationRevisions)
      .where(and(eq(configurationRevisions.configurationId, id), eq(configurationRevisions.revision, revision)));
    if (!r) throw notFound('Configuration revision');
    return r;
  }

  /** The documents of one revision (default: the current one). */
  async inputs(teamId: string, id: string, revision?: number): Promise<{ revision: number; refs: ConfigurationRefs; inputs: ConfigurationInputs }> {
    const c = await this.get(teamId, id);
    const r = await this.revisionRow(id, revision ?? c.revision);
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
      return upgradeCornerDocument(d.corner);
    };
    const refs: ConfigurationRefs = {
      vehicleId: r.vehicleId,
      vehicleRevision: r.vehicleRevision,
      frontDesignId: r.frontDesignId,
      frontDesignRevision: r.frontDesignRevision,
      rearDesignId: r.rearDesignId,
      rearDesignRevision: r.rearDesignRevision,
      trackProfile: r.trackProfile as TrackProfileId,
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

  /** Runs the shared engines on the inputs (balance with both corners linked; each corner over the profile's travel). */
  async compute(inputs: ConfigurationInputs): Promise<ConfigurationResults> {
    const profile = trackProfiles[inputs.trackProfile];
    const o = { timeLimitMs: this.computeTimeLimitMs };
    const travel = { from: profile.travelMm[0], to: profile.travelMm[1], step: (profile.travelMm[1] - profile.travelMm[0]) / 40 };
    const sweep = (corner: unknown) => this.pool.run('corner-sweep', { corner, travel }, o).then((r) => (r as { fit: unknown }).fit);
    const [balance, front, rear] = await Promise.all([
      this.pool.run('balance', { vehicle: inputs.vehicle, frontCorner: inputs.frontCorner, rearCorner: inputs.rearCorner }, o),
      sweep(inputs.frontCorner),
      sweep(inputs.rearCorner),
    ]);
    return { balance, bumpSteer: { front, rear, travelMm: profile.travelMm } };
  }

  async results(teamId: string, id: string, revision?: number) {
    const { revision: rev, refs, inputs } = await this.inputs(teamId, id, revision);
    return { revision: rev, refs, engineVersion: ENGINE_VERSION, results: await this.compute(inputs) };
  }

  /**
   * True when the user authored any configuration revision of the current review round, or any
   * vehicle / design revision the current revision references. The round is every revision after
   * the last one a decision closed (approved or changes requested); with none, all of them. So a
   * reviewer who wrote revision 1 cannot approve once someone else has renamed it.
   */
  private async authored(userId: string, configurationId: string, revision: number, orm: Executor): Promise<boolean> {
    const r = await this.revisionRow(configurationId, revision, orm);
    if (r.authorId === userId) return true;
    const [closed] = await orm
      .select({ revision: sql<number | null>`max(${configurationTransitions.revision})` })
      .from(configurationTransitions)
      .where(
        and(
          eq(configurationTransitions.configurationId, configurationId),
          sql`${configurationTransitions.toStatus} IN ('approved', 'changes_requested')`,
          sql`${configurationTransitions.revision} < ${revision}`,
        ),
      );
    const [inRound] = await orm
      .select({ n: sql<number>`count(*)::int` })
      .from(configurationRevisions)
      .where(
        and(
          eq(configurationRevisions.configurationId, configurationId),
          eq(configurationRevisions.authorId, userId),
          sql`${configurationRevisions.revision} > ${closed?.revision ?? 0}`,
          sql`${configurationRevisions.revision} <= ${revision}`,
        ),
      );
    if ((inRound?.n ?? 0) > 0) return true;
    const [v] = await orm
      .select({ authorId: vehicleRevisions.authorId })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, r.vehicleId), eq(vehicleRevisions.revision, r.vehicleRevision)));
    if (v?.authorId === userId) return true;
    const designs = await orm
      .select({ authorId: axleDesignRevisions.authorId })
      .from(axleDesignRevisions)
      .where(
        or(
          and(eq(axleDesignRevisions.designId, r.frontDesignId), eq(axleDesignRevisions.revision, r.frontDesignRevision)),
          and(eq(axleDesignRevisions.designId, r.rearDesignId), eq(axleDesignRevisions.revision, r.rearDesignRevision)),
        ),
      );
    return designs.some((d) => d.authorId === userId);
  }

  /**
   * Moves the configuration along the state machine. `expectRevision`
   * (optional) guards against deciding on a revision the caller did not see.
   * `afterTransition` runs inside the same transaction (mail outbox, activity).
   */
  async transition(
    teamId: string,
    id: string,
    actor: { id: string; roles: readonly Role[] },
    action: ReviewAction,
    o: { message?: string | undefined; expectRevision?: number | undefined } = {},
    afterTransition?: (tx: Executor, c: ConfigurationView, from: ConfigurationStatus) => Promise<void>,
  ): Promise<ConfigurationView> {
    const t = TRANSITIONS[action];
    const before = await this.get(teamId, id);
    if (!hasPermission(actor.roles, t.permission)) {
      throw new HttpError(403, 'forbidden', `Your roles in this team do not allow this (needs ${t.permission})`, { permission: t.permission });
    }
    if (o.expectRevision !== undefined && o.expectRevision !== before.revision) throw staleRevision(o.expectRevision, before);
    if (!t.from.includes(before.status)) throw invalidTransition(action, before.status);
    if (t.decision && (await this.authored(actor.id, id, before.revision, this.orm))) {
      throw new HttpError(403, 'own_revision', 'You authored this configuration or a revision it uses; another reviewer must decide', { action });
    }
    // Approval freezes what the engines say now (computed before the transaction: it may take a moment).
    const snapshot = action === 'approve' ? await this.inputs(teamId, id, before.revision) : undefined;
    const results = snapshot ? await this.compute(snapshot.inputs) : undefined;
    return this.orm.transaction(async (tx) => {
      const [row] = await tx
        .update(configurations)
        .set({ status: t.to, updatedAt: sql`now()`, updatedBy: actor.id })
        .where(and(eq(configurations.id, id), eq(configurations.revision, before.revision), eq(configurations.status, before.status)))
        .returning({ id: configurations.id });
      if (!row) {
        const now = await this.get(teamId, id, tx);
        if (now.revision !== before.revision) throw staleRevision(before.revision, now);
        throw invalidTransition(action, now.status);
      }
      const [transitionRow] = await tx
        .insert(configurationTransitions)
        .values({ configurationId: id, revision: before.revision, fromStatus: before.status, toStatus: t.to, message: o.message ?? null, actorId: actor.id })
        .returning({ id: configurationTransitions.id });
      if (snapshot && results) {
        await tx.insert(configurationApprovals).values({
          configurationId: id,
          revision: before.revision,
          engineVersion: ENGINE_VERSION,
          inputs: { refs: snapshot.refs, ...snapshot.inputs },
          results,
          message: o.message ?? null,
          approvedBy: actor.id,
        });
      }
      const after = await this.get(teamId, id, tx);
      await recordActivity(tx, {
        teamId,
        actorId: actor.id,
        action: `configuration.${action}`,
        subjectType: 'configuration',
        subjectId: id,
        summary: `Configuration "${after.name}" revision ${after.revision}: ${before.status.replace('_', ' ')} → ${t.to.replace('_', ' ')}${o.message ? ` (${o.message})` : ''}`,
      });
      await enqueueMail(tx, await this.reviewMails(tx, teamId, after, action, actor.id, o.message ?? null, transitionRow!.id));
      await afterTransition?.(tx, after, before.status);
      return after;
    });
  }

  /** Review requested → the team's reviewers; approved / changes requested → who submitted and who authored the revision. */
  private async reviewMails(
    tx: Executor,
    teamId: string,
    c: ConfigurationView,
    action: ReviewAction,
    actorId: string,
    message: string | null,
    transitionId: string,
  ): Promise<OutgoingMail[]> {
    if (action !== 'submit' && action !== 'approve' && action !== 'request-changes') return [];
    const [team] = await tx.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
    const [actor] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actorId));
    const link = `${this.publicUrl}/teams/${teamId}/configurations/${c.id}`;
    const base = { teamName: team?.name ?? '', configurationName: c.name, revision: c.revision, link, message };
    let recipients: { id: string; email: string }[];
    if (action === 'submit') {
      recipients = await tx
        .select({ id: users.id, email: users.email })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.teamId, teamId), sql`'reviewer' = ANY(${memberships.roles})`));
    } else {
      const rev = await this.revisionRow(c.id, c.revision, tx);
      const submitters = await tx
        .select({ actorId: configurationTransitions.actorId })
        .from(configurationTransitions)
        .where(and(eq(configurationTransitions.configurationId, c.id), eq(configurationTransitions.revision, c.revision), eq(configurationTransitions.toStatus, 'in_review')));
      const ids = [...new Set([rev.authorId, ...submitters.map((x) => x.actorId)].filter((x): x is string => !!x))];
      recipients = ids.length
        ? await tx
            .select({ id: users.id, email: users.email })
            .from(users)
            .where(sql`${users.id} IN (${sql.join(ids.map((x) => sql`${x}`), sql`, `)})`)
        : [];
    }
    const text =
      action === 'submit'
        ? mailText.reviewRequested({ ...base, submitterName: actor?.name ?? 'Someone' })
        : mailText.decisionMade({ ...base, deciderName: actor?.name ?? 'A reviewer', decision: action === 'approve' ? 'approved' : 'changes requested' });
    return recipients
      .filter((r) => r.id !== actorId)
      .map((r) => ({ kind: action === 'submit' ? 'review-requested' : 'decision-made', to: r.email, teamId, ...text, dedupeKey: `transition:${transitionId}:${r.id}` }));
  }

  async approvals(teamId: string, id: string) {
    await this.get(teamId, id);
    return this.orm
      .select({
        id: configurationApprovals.id,
        revision: configurationApprovals.revision,
        engineVersion: configurationApprovals.engineVersion,
        message: configurationApprovals.message,
        approvedByName: users.displayName,
        approvedAt: configurationApprovals.approvedAt,
      })
      .from(configurationApprovals)
      .leftJoin(users, eq(users.id, configurationApprovals.approvedBy))
      .where(eq(configurationApprovals.configurationId, id))
      .orderBy(desc(configurationApprovals.approvedAt));
  }

  /** An approval's frozen inputs' track profile and results, as stored. */
  async frozen(teamId: string, id: string, approvalId: string): Promise<{ trackProfile: string; results: ConfigurationResults }> {
    await this.get(teamId, id);
    const [a] = await this.orm
      .select({ inputs: configurationApprovals.inputs, results: configurationApprovals.results })
      .from(configurationApprovals)
      .where(and(eq(configurationApprovals.id, approvalId), eq(configurationApprovals.configurationId, id)));
    if (!a) throw notFound('Approval');
    return { trackProfile: (a.inputs as ConfigurationInputs).trackProfile, results: a.results as ConfigurationResults };
  }

  /** The frozen snapshot as approved, and beside it what the current engine computes from the same frozen inputs. */
  async approval(teamId: string, id: string, approvalId: string) {
    await this.get(teamId, id);
    const [a] = await this.orm
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
      .where(and(eq(configurationApprovals.id, approvalId), eq(configurationApprovals.configurationId, id)));
    if (!a) throw notFound('Approval');
    const frozen = a.inputs as ConfigurationInputs & { refs: ConfigurationRefs };
    let recompute: { engineVersion: string; differences: Difference[] } | { engineVersion: string; error: { code: string; message: string } };
    try {
      const now = await this.compute({ vehicle: frozen.vehicle, frontCorner: frozen.frontCorner, rearCorner: frozen.rearCorner, trackProfile: frozen.trackProfile });
      recompute = { engineVersion: ENGINE_VERSION, differences: diffResults(a.results, now) };
    } catch (err) {
      // An engine that can no longer compute the frozen inputs is itself a difference worth showing.
      const e = err as { code?: string; message?: string };
      recompute = { engineVersion: ENGINE_VERSION, error: { code: e.code ?? 'recompute_failed', message: e.message ?? 'The current engine could not recompute this snapshot' } };
    }
    return { ...a, recompute };
  }

  /** Changed inputs and changed key results of two configuration revisions, side by side. */
  async compare(teamId: string, a: { id: string; revision?: number | undefined }, b: { id: string; revision?: number | undefined }) {
    const [ia, ib] = await Promise.all([this.inputs(teamId, a.id, a.revision), this.inputs(teamId, b.id, b.revision)]);
    const [ra, rb] = await Promise.all([this.compute(ia.inputs), this.compute(ib.inputs)]);
    return {
      engineVersion: ENGINE_VERSION,
      a: { configurationId: a.id, revision: ia.revision, refs: ia.refs },
      b: { configurationId: b.id, revision: ib.revision, refs: ib.refs },
      inputs: diffDocuments(ia.inputs, ib.inputs, { expandArrays: true }),
      results: diffResults(ra, rb),
    };
  }

  // ---- review comments -------------------------------------------------------------

  async comments(teamId: string, id: string) {
    await this.get(teamId, id);
    const rows = await this.orm
      .select({
        id: reviewComments.id,
        revision: reviewComments.revision,
        parentId: reviewComments.parentId,
        resultRef: reviewComments.resultRef,
        body: reviewComments.body,
        authorId: reviewComments.authorId,
        authorName: users.displayName,
        createdAt: reviewComments.createdAt,
        resolvedAt: reviewComments.resolvedAt,
      })
      .from(reviewComments)
      .leftJoin(users, eq(users.id, reviewComments.authorId))
      .where(eq(reviewComments.configurationId, id))
      .orderBy(asc(reviewComments.createdAt));
    // Threads: each root comment with its replies in order.
    const threads = rows.filter((r) => r.parentId === null).map((root) => ({ ...root, resolved: root.resolvedAt !== null, replies: [] as typeof rows }));
    const byId = new Map(threads.map((t) => [t.id, t]));
    for (const r of rows) if (r.parentId !== null) byId.get(r.parentId)?.replies.push(r);
    return threads;
  }

  async addComment(teamId: string, id: string, authorId: string, input: { body: string; resultRef?: string | undefined; parentId?: string | undefined }) {
    const c = await this.get(teamId, id);
    if (input.parentId !== undefined) {
      const [p] = await this.orm
        .select({ parentId: reviewComments.parentId })
        .from(reviewComments)
        .where(and(eq(reviewComments.id, input.parentId), eq(reviewComments.configurationId, id)));
      if (!p) throw new HttpError(404, 'not_found', 'The comment replied to was not found', { field: 'parentId' });
      if (p.parentId !== null) throw new HttpError(400, 'invalid_input', 'Reply to the first comment of a thread', { fields: [{ path: 'parentId', message: 'is a reply itself' }] });
    }
    return this.orm.transaction(async (tx) => {
      const [row] = await tx
        .insert(reviewComments)
        .values({ configurationId: id, revision: c.revision, parentId: input.parentId ?? null, resultRef: input.resultRef ?? null, body: input.body, authorId })
        .returning();
      const on = input.resultRef ? ` on ${input.resultRef}` : '';
      await recordActivity(tx, { teamId, actorId: authorId, action: 'comment.create', subjectType: 'comment', subjectId: row!.id, summary: `Commented${on} on configuration "${c.name}": ${input.body.slice(0, 200)}` });
      return row!;
    });
  }

  async resolveThread(teamId: string, id: string, commentId: string, userId: string, resolved: boolean) {
    await this.get(teamId, id);
    const [row] = await this.orm
      .update(reviewComments)
      .set(resolved ? { resolvedAt: sql`now()`, resolvedBy: userId } : { resolvedAt: null, resolvedBy: null })
      .where(and(eq(reviewComments.id, commentId), eq(reviewComments.configurationId, id), sql`${reviewComments.parentId} IS NULL`))
      .returning();
    if (!row) throw notFound('Comment thread');
    return { ...row, resolved: row.resolvedAt !== null };
  }

  /** True when any configuration using this vehicle or design was ever approved (then it is archived, never deleted). */
  async hasApprovals(where: { vehicleId?: string; designId?: string; teamId?: string }): Promise<boolean> {
    const cond = where.teamId
      ? eq(configurations.teamId, where.teamId)
      : where.vehicleId
        ? eq(configurations.vehicleId, where.vehicleId)
        : or(eq(configurations.frontDesignId, where.designId!), eq(configurations.rearDesignId, where.designId!));
    const [r] = await this.orm
      .select({ n: sql<number>`count(*)::int` })
      .from(configurationApprovals)
      .innerJoin(configurations, eq(configurations.id, configurationApprovals.configurationId))
      .where(cond);
    return (r?.n ?? 0) > 0;
  }
}

/** Result differences as key figures: curves, tables and echoed inputs left out. */
export function diffResults(a: unknown, b: unknown): Difference[] {
  return diffDocuments(a, b, { dropArrays: true, skip: ['balance.effectiveVehicle', 'balance.caution', 'balance.sensitivity', 'balance.comparison'] });
}
