/**
 * Axle designs (front or rear corner geometry variants of a vehicle), with
 * immutable revisions like vehicles. A geometry change returns the design to
 * `draft`: an approval is for the geometry it was given on.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { PgUpdateSetSource } from 'drizzle-orm/pg-core';
import type { Executor, Orm } from '../db/client.js';
import { axleDesignRevisions, axleDesigns, users, vehicles, type DesignStatus } from '../db/schema.js';
import { DomainError, InputError, notFound } from '../../shared/errors.js';
import { cornerSchema, upgradeCornerDocument, type Corner } from '../../shared/schema/corner.js';
import type { CadFrame } from '../../shared/io/cad-frame.js';
import { prepareHardpointImport } from '../../shared/io/hardpoints.js';

import { parseDocument, writeRevision, type RevisionedDocument, type RevisionRow } from './revisions.js';
import { changeWords, recordActivity } from './activity.js';
import type { AxleName } from '../../shared/schema/axle.js';
import type { ImportPreview } from '../../shared/api/documents.js';

export interface AxleDesignView {
  id: string;
  vehicleId: string;
  axle: AxleName;
  name: string;
  revision: number;
  status: DesignStatus;
  archived: boolean;
  corner: Corner;
  updatedAt: Date;
  updatedByName: string | null;
}

/** What an editor's revision of a design may change. */
export interface AxleDesignEdit {
  name?: string | undefined;
  archived?: boolean | undefined;
  corner?: Corner;
  message?: string | undefined;
}

/** What a revision of a design may write (an accepted proposal also sets the status). */
export interface AxleDesignChange {
  name?: string | undefined;
  archived?: boolean | undefined;
  corner?: unknown;
  status?: DesignStatus;
}

type AxleDesignRow = typeof axleDesigns.$inferSelect;

export const parseCorner = (doc: unknown): Corner => parseDocument(cornerSchema, upgradeCornerDocument, doc, 'corner');

/**
 * A corner as stored (design, revision or proposal rows): every one passed `parseCorner`
 * before it was written, and the upgrade brings an older format to today's.
 */
export const storedCorner = (doc: unknown): Corner => upgradeCornerDocument(doc) as Corner;

const columns = {
  id: axleDesigns.id,
  vehicleId: axleDesigns.vehicleId,
  axle: axleDesigns.axle,
  name: axleDesigns.name,
  revision: axleDesigns.revision,
  status: axleDesigns.status,
  archived: axleDesigns.archived,
  updatedAt: axleDesigns.updatedAt,
  updatedByName: users.displayName,
};

export class AxleDesigns {
  constructor(private readonly orm: Orm) {}

  /** The vehicle's designs (`vehicle` as loaded for the team). */
  async list(vehicle: { id: string }, includeArchived: boolean) {
    const vehicleId = vehicle.id;
    const where = includeArchived
      ? eq(axleDesigns.vehicleId, vehicleId)
      : and(eq(axleDesigns.vehicleId, vehicleId), eq(axleDesigns.archived, false));
    return this.orm
      .select(columns)
      .from(axleDesigns)
      .leftJoin(users, eq(users.id, axleDesigns.updatedBy))
      .where(where)
      .orderBy(asc(axleDesigns.axle), asc(axleDesigns.name));
  }

  async get(teamId: string, designId: string, orm: Executor = this.orm): Promise<AxleDesignView> {
    const [d] = await orm
      .select({ ...columns, corner: axleDesigns.corner })
      .from(axleDesigns)
      .innerJoin(vehicles, eq(vehicles.id, axleDesigns.vehicleId))
      .leftJoin(users, eq(users.id, axleDesigns.updatedBy))
      .where(and(eq(axleDesigns.id, designId), eq(vehicles.teamId, teamId)));
    if (!d) throw notFound('Axle design');
    return { ...d, corner: storedCorner(d.corner) };
  }

  /** A new design of the team's vehicle (`vehicle` as loaded for the team). */
  async create(teamId: string, vehicle: { id: string }, authorId: string, input: { axle: AxleName; name: string; corner: Corner }): Promise<AxleDesignView> {
    const vehicleId = vehicle.id;
    return this.orm.transaction(async (tx) => {
      const [d] = await tx
        .insert(axleDesigns)
        .values({ vehicleId, axle: input.axle, name: input.name, corner: input.corner, updatedBy: authorId })
        .returning();
      if (!d) throw new Error('insert returned nothing');
      await tx.insert(axleDesignRevisions).values({
        designId: d.id,
        revision: 1,
        name: d.name,
        status: d.status,
        archived: false,
        corner: d.corner,
        message: 'Created',
        authorId,
      });
      await recordActivity(tx, { teamId, actorId: authorId, action: 'design.create', subjectType: 'axle_design', subjectId: d.id, designId: d.id, summary: `Created ${d.axle} axle design "${d.name}"` });
      return this.get(teamId, d.id, tx);
    });
  }

  /** Applies a change based on `baseRevision`; a geometry change returns the design to draft. */
  async update(teamId: string, designId: string, authorId: string, baseRevision: number, change: AxleDesignEdit): Promise<AxleDesignView> {
    return this.orm.transaction(async (tx) => {
      const { row } = await writeRevision(tx, this.document, {
        teamId,
        id: designId,
        baseRevision,
        change: change.corner !== undefined ? { ...change, status: 'draft' } : change,
        authorId,
        message: change.message ?? null,
        activity: (_previous, row) => ({
          action: change.corner !== undefined ? 'design.corner' : 'design.update',
          subjectType: 'axle_design',
          subjectId: designId,
          designId,
          summary: `Axle design "${row.name}" revision ${row.revision}: ${changeWords(change, 'corner')}${change.message ? ` (${change.message})` : ''}`,
        }),
      });
      return this.get(teamId, row.id, tx);
    });
  }

  /** How an axle design is locked, updated and its revision row written (services/revisions.ts); proposals accept through it. */
  readonly document: RevisionedDocument<AxleDesignRow, AxleDesignChange, AxleDesignView> = {
    what: 'Axle design',
    lock: async (tx, teamId, id) => {
      const [d] = await tx
        .select({ design: axleDesigns })
        .from(axleDesigns)
        .innerJoin(vehicles, eq(vehicles.id, axleDesigns.vehicleId))
        .where(and(eq(axleDesigns.id, id), eq(vehicles.teamId, teamId)))
        .for('update', { of: axleDesigns });
      return d?.design;
    },
    update: async (tx, previous, revision, change, authorId) => {
      const set: PgUpdateSetSource<typeof axleDesigns> = { revision, updatedAt: sql`now()`, updatedBy: authorId };
      if (change.name !== undefined) set.name = change.name;
      if (change.archived !== undefined) set.archived = change.archived;
      if (change.corner !== undefined) set.corner = change.corner;
      if (change.status !== undefined) set.status = change.status;
      const [row] = await tx.update(axleDesigns).set(set).where(eq(axleDesigns.id, previous.id)).returning();
      if (!row) throw new Error('update of a locked axle design returned nothing');
      return row;
    },
    insertRevision: async (tx, row, o) => {
      await tx
        .insert(axleDesignRevisions)
        .values({ designId: row.id, revision: row.revision, name: row.name, status: row.status, archived: row.archived, corner: row.corner, ...o });
    },
    view: (tx, teamId, id) => this.get(teamId, id, tx),
  };

  /**
   * Reads an uploaded hardpoint file against the design's current corner:
   * every bad row named (400 `import_rows`), the merged corner checked by the
   * corner schema (400 `import_geometry`), and nothing saved either way.
   * `options.corner` is the editor's working corner (unsaved edits), merged
   * into instead of the stored one so the preview shows what the user has.
   */
  async previewImport(
    design: AxleDesignView,
    file: { name: string; text: string },
    options: { frame?: CadFrame | undefined; corner?: Corner | undefined } = {},
  ): Promise<ImportPreview> {
    const stored = parseCorner(design.corner);
    if (options.corner && options.corner.type !== stored.type) {
      throw new DomainError('invalid', 'invalid_input', `Invalid upload fields: corner: this design is a ${stored.type}, not a ${options.corner.type}`, {
        fields: [{ path: 'corner.type', message: `must be ${stored.type}` }],
      });
    }
    const prepared = prepareHardpointImport(options.corner ?? stored, file.name, file.text, options.frame);
    if (!prepared.ok) {
      const n = prepared.errors.length;
      throw new DomainError('invalid', 'import_rows', `${file.name} cannot be imported: ${prepared.errors[0]}${n > 1 ? ` (and ${n - 1} more)` : ''}`, {
        errors: prepared.errors,
      });
    }
    try {
      const corner = parseCorner(prepared.corner);
      return { corner, changedPoints: prepared.changedPoints, warnings: prepared.warnings, baseRevision: design.revision };
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      const fields = e.issues;
      throw new DomainError('invalid', 'import_geometry', `The imported points break the corner: ${fields[0] ? `${fields[0].path}: ${fields[0].message}` : e.message}`, {
        fields,
        changedPoints: prepared.changedPoints,
      });
    }
  }

  /** The design's revisions, newest first (`design` as loaded for the team). */
  async revisions(design: { id: string }): Promise<(RevisionRow & { status: DesignStatus })[]> {
    return this.orm
      .select({
        revision: axleDesignRevisions.revision,
        status: axleDesignRevisions.status,
        message: axleDesignRevisions.message,
        authorName: users.displayName,
        createdAt: axleDesignRevisions.createdAt,
      })
      .from(axleDesignRevisions)
      .leftJoin(users, eq(users.id, axleDesignRevisions.authorId))
      .where(eq(axleDesignRevisions.designId, design.id))
      .orderBy(desc(axleDesignRevisions.revision));
  }

  async revision(teamId: string, designId: string, revision: number) {
    return this.revisionOf(await this.get(teamId, designId), revision);
  }

  /** One stored revision of the design (`design` as loaded for the team). */
  async revisionOf(design: { id: string }, revision: number) {
    const [r] = await this.orm
      .select({
        revision: axleDesignRevisions.revision,
        name: axleDesignRevisions.name,
        status: axleDesignRevisions.status,
        archived: axleDesignRevisions.archived,
        corner: axleDesignRevisions.corner,
        message: axleDesignRevisions.message,
        authorName: users.displayName,
        createdAt: axleDesignRevisions.createdAt,
      })
      .from(axleDesignRevisions)
      .leftJoin(users, eq(users.id, axleDesignRevisions.authorId))
      .where(and(eq(axleDesignRevisions.designId, design.id), eq(axleDesignRevisions.revision, revision)));
    if (!r) throw notFound('Revision');
    return { ...r, corner: storedCorner(r.corner) };
  }
}
