/**
 * Configurations: reading, creating and revising them (the references to one
 * vehicle revision and one front and one rear axle design revision, plus a
 * track profile), their revisions and their review history. Any new revision
 * returns the configuration to draft.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { alias, type PgUpdateSetSource } from 'drizzle-orm/pg-core';
import type { Executor, Orm } from '../../db/client.js';
import {
  axleDesignRevisions,
  axleDesigns,
  configurationRevisions,
  configurations,
  configurationTransitions,
  users,
  vehicleRevisions,
  vehicles,
  type ConfigurationStatus,
} from '../../db/schema.js';
import { DomainError, notFound } from '../../../shared/errors.js';
import type { TrackProfileId } from '../../../shared/tracks/profiles.js';
import { writeRevision, type RevisionedDocument } from '../revisions.js';
import { recordActivity } from '../activity.js';
import type { AxleName } from '../../../shared/schema/axle.js';

export interface ConfigurationRefs {
  vehicleId: string;
  vehicleRevision: number;
  frontDesignId: string;
  frontDesignRevision: number;
  rearDesignId: string;
  rearDesignRevision: number;
  trackProfile: TrackProfileId;
}

export interface RefsInput {
  vehicleId: string;
  vehicleRevision?: number | undefined;
  frontDesignId: string;
  frontDesignRevision?: number | undefined;
  rearDesignId: string;
  rearDesignRevision?: number | undefined;
  trackProfile: TrackProfileId;
}

/** What a new revision may change; a changed vehicle or design without a revision means its current revision. */
export type ConfigurationChange = { [K in keyof RefsInput]?: RefsInput[K] | undefined } & { name?: string | undefined; message?: string | undefined };

export type ConfigurationView = {
  id: string;
  name: string;
  status: ConfigurationStatus;
  revision: number;
  archived: boolean;
  vehicle: { id: string; name: string; revision: number };
  front: { designId: string; name: string; revision: number };
  rear: { designId: string; name: string; revision: number };
  trackProfile: TrackProfileId;
  updatedAt: Date;
  updatedByName: string | null;
  createdAt: Date;
};

type ConfigurationRow = typeof configurations.$inferSelect;

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

function selectViews(orm: Executor) {
  return orm
    .select(viewColumns)
    .from(configurations)
    .innerJoin(vehicleRef, eq(vehicleRef.id, configurations.vehicleId))
    .innerJoin(frontRef, eq(frontRef.id, configurations.frontDesignId))
    .innerJoin(rearRef, eq(rearRef.id, configurations.rearDesignId))
    .leftJoin(updater, eq(updater.id, configurations.updatedBy));
}

function toView(r: Awaited<ReturnType<typeof selectViews>>[number]): ConfigurationView {
  return {
    id: r.id,
    name: r.name,
    status: r.status,
    revision: r.revision,
    archived: r.archived,
    vehicle: { id: r.vehicleId, name: r.vehicleName, revision: r.vehicleRevision },
    front: { designId: r.frontDesignId, name: r.frontDesignName, revision: r.frontDesignRevision },
    rear: { designId: r.rearDesignId, name: r.rearDesignName, revision: r.rearDesignRevision },
    trackProfile: r.trackProfile,
    updatedAt: r.updatedAt,
    updatedByName: r.updatedByName ?? null,
    createdAt: r.createdAt,
  };
}

export class ConfigurationStore {
  constructor(private readonly orm: Orm) {}

  async list(teamId: string, includeArchived: boolean): Promise<ConfigurationView[]> {
    const where = includeArchived ? eq(configurations.teamId, teamId) : and(eq(configurations.teamId, teamId), eq(configurations.archived, false));
    const rows = await selectViews(this.orm).where(where).orderBy(asc(configurations.name));
    return rows.map(toView);
  }

  async get(teamId: string, id: string, orm: Executor = this.orm): Promise<ConfigurationView> {
    const [r] = await selectViews(orm).where(and(eq(configurations.id, id), eq(configurations.teamId, teamId)));
    if (!r) throw notFound('Configuration');
    return toView(r);
  }

  /** Checks the references belong to this team and vehicle, sit on the right axles and exist; fills missing revisions with the current ones. */
  private async resolveRefs(teamId: string, input: RefsInput, orm: Executor): Promise<ConfigurationRefs> {
    const [v] = await orm.select({ id: vehicles.id, revision: vehicles.revision }).from(vehicles).where(and(eq(vehicles.id, input.vehicleId), eq(vehicles.teamId, teamId)));
    if (!v) throw notFound('Vehicle', { field: 'vehicleId' });
    const vehicleRevision = input.vehicleRevision ?? v.revision;
    const [vr] = await orm
      .select({ data: vehicleRevisions.data })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, v.id), eq(vehicleRevisions.revision, vehicleRevision)));
    if (!vr) throw notFound(`Vehicle revision ${vehicleRevision}`, { field: 'vehicleRevision' });
    if (vr.data === null) {
      throw new DomainError('conflict', 'incomplete_configuration', `Vehicle revision ${vehicleRevision} has no vehicle data yet; enter the balance model data first`, {
        field: 'vehicleRevision',
      });
    }
    const design = async (axle: AxleName, id: string, revision: number | undefined) => {
      const [d] = await orm
        .select({ id: axleDesigns.id, axle: axleDesigns.axle, revision: axleDesigns.revision })
        .from(axleDesigns)
        .where(and(eq(axleDesigns.id, id), eq(axleDesigns.vehicleId, v.id)));
      const field = `${axle}DesignId`;
      if (!d) throw new DomainError('not_found', 'not_found', `The ${axle} axle design is not one of this vehicle's`, { field });
      if (d.axle !== axle) throw new DomainError('invalid', 'invalid_input', `That design is a ${d.axle} axle design`, { fields: [{ path: field, message: `is a ${d.axle} axle design` }] });
      const rev = revision ?? d.revision;
      const [dr] = await orm
        .select({ revision: axleDesignRevisions.revision })
        .from(axleDesignRevisions)
        .where(and(eq(axleDesignRevisions.designId, id), eq(axleDesignRevisions.revision, rev)));
      if (!dr) throw notFound(`${axle} design revision ${rev}`, { field: `${axle}DesignRevision` });
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
      if (!c) throw new Error('insert returned nothing');
      await tx.insert(configurationRevisions).values({ configurationId: c.id, revision: 1, name: input.name, ...refs, message: input.message ?? 'Created', authorId });
      await recordActivity(tx, { teamId, actorId: authorId, action: 'configuration.create', subjectType: 'configuration', subjectId: c.id, summary: `Created configuration "${input.name}"` });
      return this.get(teamId, c.id, tx);
    });
  }

  /** A new revision (other references, name or track profile); always back to draft. */
  async revise(teamId: string, id: string, authorId: string, baseRevision: number, change: ConfigurationChange): Promise<ConfigurationView> {
    return this.orm.transaction(async (tx) => {
      const { previous, row } = await writeRevision(tx, this.document, {
        teamId,
        id,
        baseRevision,
        change,
        authorId,
        message: change.message ?? null,
        activity: (_previous, row) => ({
          action: 'configuration.revise',
          subjectType: 'configuration',
          subjectId: id,
          summary: `Configuration "${row.name}" revision ${row.revision}${change.message ? ` (${change.message})` : ''}`,
        }),
      });
      // The status this revision replaces was read under the row lock: a review decision may have landed just before.
      if (previous.status !== 'draft') {
        await tx.insert(configurationTransitions).values({
          configurationId: id,
          revision: row.revision,
          fromStatus: previous.status,
          toStatus: 'draft',
          message: `New revision ${row.revision}`,
          actorId: authorId,
        });
      }
      return this.get(teamId, id, tx);
    });
  }

  /** How a configuration is locked, updated and its revision row written (services/revisions.ts). */
  private readonly document: RevisionedDocument<ConfigurationRow, ConfigurationChange, ConfigurationView> = {
    what: 'Configuration',
    lock: async (tx, teamId, id) => {
      const [c] = await tx.select().from(configurations).where(and(eq(configurations.id, id), eq(configurations.teamId, teamId))).for('update');
      return c;
    },
    update: async (tx, previous, revision, change, authorId) => {
      const refs = await this.resolveRefs(
        previous.teamId,
        {
          vehicleId: change.vehicleId ?? previous.vehicleId,
          // A changed vehicle or design without a revision means its current revision.
          vehicleRevision: change.vehicleRevision ?? (change.vehicleId ? undefined : previous.vehicleRevision),
          frontDesignId: change.frontDesignId ?? previous.frontDesignId,
          frontDesignRevision: change.frontDesignRevision ?? (change.frontDesignId ? undefined : previous.frontDesignRevision),
          rearDesignId: change.rearDesignId ?? previous.rearDesignId,
          rearDesignRevision: change.rearDesignRevision ?? (change.rearDesignId ? undefined : previous.rearDesignRevision),
          trackProfile: change.trackProfile ?? previous.trackProfile,
        },
        tx,
      );
      const set: PgUpdateSetSource<typeof configurations> = {
        ...refs,
        name: change.name ?? previous.name,
        status: 'draft',
        revision,
        updatedAt: sql`now()`,
        updatedBy: authorId,
      };
      const [row] = await tx.update(configurations).set(set).where(eq(configurations.id, previous.id)).returning();
      if (!row) throw new Error('update of a locked configuration returned nothing');
      return row;
    },
    insertRevision: async (tx, row, o) => {
      await tx.insert(configurationRevisions).values({
        configurationId: row.id,
        revision: row.revision,
        name: row.name,
        vehicleId: row.vehicleId,
        vehicleRevision: row.vehicleRevision,
        frontDesignId: row.frontDesignId,
        frontDesignRevision: row.frontDesignRevision,
        rearDesignId: row.rearDesignId,
        rearDesignRevision: row.rearDesignRevision,
        trackProfile: row.trackProfile,
        ...o,
      });
    },
    view: (tx, teamId, id) => this.get(teamId, id, tx),
  };

  /** Archive or restore (configurations are never deleted). */
  async setArchived(teamId: string, c: { id: string }, userId: string, archived: boolean): Promise<ConfigurationView> {
    await this.orm.update(configurations).set({ archived, updatedAt: sql`now()`, updatedBy: userId }).where(eq(configurations.id, c.id));
    return this.get(teamId, c.id);
  }

  /** The configuration's revisions, newest first (`c` as loaded for the team). */
  async revisions(c: { id: string }) {
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
      .where(eq(configurationRevisions.configurationId, c.id))
      .orderBy(desc(configurationRevisions.revision));
  }

  /** Every review transition, oldest first (`c` as loaded for the team). */
  async history(c: { id: string }) {
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
      .where(eq(configurationTransitions.configurationId, c.id))
      .orderBy(asc(configurationTransitions.createdAt));
  }

  /** One stored revision row (404 when there is no such revision). */
  async revisionRow(id: string, revision: number, orm: Executor = this.orm) {
    const [r] = await orm
      .select()
      .from(configurationRevisions)
      .where(and(eq(configurationRevisions.configurationId, id), eq(configurationRevisions.revision, revision)));
    if (!r) throw notFound('Configuration revision');
    return r;
  }
}
