/**
 * Vehicles of a team. Every change (data, name, archived) is a new immutable
 * revision written in the same transaction as a conditional update on the
 * current revision, so a stale write can never overwrite a newer one.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { PgUpdateSetSource } from 'drizzle-orm/pg-core';
import type { Executor, Orm } from '../db/client.js';
import { users, vehicleRevisions, vehicles } from '../db/schema.js';
import { notFound } from '../../shared/errors.js';
import { upgradeVehicleDocument, vehicleSchema, type Vehicle } from '../../shared/schema/vehicle.js';
import { parseDocument, writeRevision, type RevisionedDocument, type RevisionRow } from './revisions.js';
import { changeWords, recordActivity } from './activity.js';

export interface VehicleView {
  id: string;
  name: string;
  archived: boolean;
  revision: number;
  data: unknown;
  updatedAt: Date;
  updatedByName: string | null;
}

export type VehicleSummary = Omit<VehicleView, 'data'>;

/** What one vehicle revision may change. */
export interface VehicleChange {
  name?: string | undefined;
  archived?: boolean | undefined;
  data?: Vehicle;
  message?: string | undefined;
}

type VehicleRow = typeof vehicles.$inferSelect;

export const parseVehicleData = (doc: unknown): Vehicle => parseDocument(vehicleSchema, upgradeVehicleDocument, doc, 'vehicle data');

const summaryColumns = {
  id: vehicles.id,
  name: vehicles.name,
  archived: vehicles.archived,
  revision: vehicles.revision,
  updatedAt: vehicles.updatedAt,
  updatedByName: users.displayName,
};

export class Vehicles {
  constructor(private readonly orm: Orm) {}

  async list(teamId: string, includeArchived: boolean): Promise<VehicleSummary[]> {
    const where = includeArchived ? eq(vehicles.teamId, teamId) : and(eq(vehicles.teamId, teamId), eq(vehicles.archived, false));
    return this.orm.select(summaryColumns).from(vehicles).leftJoin(users, eq(users.id, vehicles.updatedBy)).where(where).orderBy(asc(vehicles.name));
  }

  async get(teamId: string, vehicleId: string, orm: Executor = this.orm): Promise<VehicleView> {
    const [v] = await orm
      .select({ ...summaryColumns, data: vehicles.data })
      .from(vehicles)
      .leftJoin(users, eq(users.id, vehicles.updatedBy))
      .where(and(eq(vehicles.id, vehicleId), eq(vehicles.teamId, teamId)));
    if (!v) throw notFound('Vehicle');
    return { ...v, data: v.data === null ? null : upgradeVehicleDocument(v.data) };
  }

  async create(teamId: string, authorId: string, input: { name: string; data?: unknown }): Promise<VehicleView> {
    const data = input.data === undefined || input.data === null ? null : parseVehicleData(input.data);
    return this.orm.transaction(async (tx) => {
      const [v] = await tx.insert(vehicles).values({ teamId, name: input.name, data, updatedBy: authorId }).returning({ id: vehicles.id });
      if (!v) throw new Error('insert returned nothing');
      await tx.insert(vehicleRevisions).values({ vehicleId: v.id, revision: 1, name: input.name, archived: false, data, message: 'Created', authorId });
      await recordActivity(tx, { teamId, actorId: authorId, action: 'vehicle.create', subjectType: 'vehicle', subjectId: v.id, summary: `Created vehicle "${input.name}"` });
      return this.get(teamId, v.id, tx);
    });
  }

  /** Applies a change based on `baseRevision`; 409 `stale_revision` when someone saved in between. */
  async update(teamId: string, vehicleId: string, authorId: string, baseRevision: number, change: VehicleChange): Promise<VehicleView> {
    return this.orm.transaction(async (tx) => {
      const { row } = await writeRevision(tx, this.document, {
        teamId,
        id: vehicleId,
        baseRevision,
        change,
        authorId,
        message: change.message ?? null,
        activity: (_previous, row) => ({
          action: change.data !== undefined ? 'vehicle.data' : 'vehicle.update',
          subjectType: 'vehicle',
          subjectId: vehicleId,
          summary: `Vehicle "${row.name}" revision ${row.revision}: ${changeWords(change, 'data')}${change.message ? ` (${change.message})` : ''}`,
        }),
      });
      return this.get(teamId, row.id, tx);
    });
  }

  /** How a vehicle is locked, updated and its revision row written (services/revisions.ts). */
  private readonly document: RevisionedDocument<VehicleRow, VehicleChange, VehicleView> = {
    what: 'Vehicle',
    lock: async (tx, teamId, id) => {
      const [v] = await tx.select().from(vehicles).where(and(eq(vehicles.id, id), eq(vehicles.teamId, teamId))).for('update');
      return v;
    },
    update: async (tx, previous, revision, change, authorId) => {
      const set: PgUpdateSetSource<typeof vehicles> = { revision, updatedAt: sql`now()`, updatedBy: authorId };
      if (change.name !== undefined) set.name = change.name;
      if (change.archived !== undefined) set.archived = change.archived;
      if (change.data !== undefined) set.data = change.data;
      const [row] = await tx.update(vehicles).set(set).where(eq(vehicles.id, previous.id)).returning();
      if (!row) throw new Error('update of a locked vehicle returned nothing');
      return row;
    },
    insertRevision: async (tx, row, o) => {
      await tx.insert(vehicleRevisions).values({ vehicleId: row.id, revision: row.revision, name: row.name, archived: row.archived, data: row.data, ...o });
    },
    view: (tx, teamId, id) => this.get(teamId, id, tx),
  };

  /** The vehicle's revisions, newest first (`vehicle` as loaded for the team). */
  async revisions(vehicle: { id: string }): Promise<RevisionRow[]> {
    return this.orm
      .select({ revision: vehicleRevisions.revision, message: vehicleRevisions.message, authorName: users.displayName, createdAt: vehicleRevisions.createdAt })
      .from(vehicleRevisions)
      .leftJoin(users, eq(users.id, vehicleRevisions.authorId))
      .where(eq(vehicleRevisions.vehicleId, vehicle.id))
      .orderBy(desc(vehicleRevisions.revision));
  }

  /** One stored revision of the vehicle (`vehicle` as loaded for the team). */
  async revision(vehicle: { id: string }, revision: number) {
    const [r] = await this.orm
      .select({
        revision: vehicleRevisions.revision,
        name: vehicleRevisions.name,
        archived: vehicleRevisions.archived,
        data: vehicleRevisions.data,
        message: vehicleRevisions.message,
        authorName: users.displayName,
        createdAt: vehicleRevisions.createdAt,
      })
      .from(vehicleRevisions)
      .leftJoin(users, eq(users.id, vehicleRevisions.authorId))
      .where(and(eq(vehicleRevisions.vehicleId, vehicle.id), eq(vehicleRevisions.revision, revision)));
    if (!r) throw notFound('Revision');
    return { ...r, data: r.data === null ? null : upgradeVehicleDocument(r.data) };
  }
}
