/**
 * Axle designs (front or rear corner geometry variants of a vehicle), with
 * immutable revisions like vehicles. A geometry change returns the design to
 * `draft`: an approval is for the geometry it was given on.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { Executor, Orm } from '../db/client.js';
import { axleDesignRevisions, axleDesigns, users, vehicles, type Axle, type DesignStatus } from '../db/schema.js';
import { HttpError, notFound } from '../http/errors.js';
import { cornerSchema, upgradeCornerDocument, type Corner } from '../../shared/schema/corner.js';
import type { CadFrame } from '../../shared/io/cad-frame.js';
import { prepareHardpointImport, type ChangedPoint } from '../../shared/io/hardpoints.js';

/** `POST …/import`: what the file would make of the design's corner; nothing is stored. */
export interface ImportPreview {
  corner: Corner;
  changedPoints: ChangedPoint[];
  warnings: string[];
  /** The design revision the preview was made on (save with it as baseRevision). */
  baseRevision: number;
}
import { parseDocument, staleRevision, type RevisionRow } from './revisions.js';
import { changeWords, recordActivity } from './activity.js';

export interface AxleDesignView {
  id: string;
  vehicleId: string;
  axle: Axle;
  name: string;
  revision: number;
  status: DesignStatus;
  archived: boolean;
  corner: unknown;
  updatedAt: Date;
  updatedByName: string | null;
}

export const parseCorner = (doc: unknown): Corner => parseDocument(cornerSchema, upgradeCornerDocument, doc, 'corner');

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

  private async vehicleInTeam(teamId: string, vehicleId: string): Promise<void> {
    const [v] = await this.orm.select({ id: vehicles.id }).from(vehicles).where(and(eq(vehicles.id, vehicleId), eq(vehicles.teamId, teamId)));
    if (!v) throw notFound('Vehicle');
  }

  async list(teamId: string, vehicleId: string, includeArchived: boolean) {
    await this.vehicleInTeam(teamId, vehicleId);
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
    return { ...d, corner: upgradeCornerDocument(d.corner) };
  }

  async create(teamId: string, vehicleId: string, authorId: string, input: { axle: Axle; name: string; corner: Corner }): Promise<AxleDesignView> {
    await this.vehicleInTeam(teamId, vehicleId);
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

  async update(
    teamId: string,
    designId: string,
    authorId: string,
    baseRevision: number,
    change: { name?: string | undefined; archived?: boolean | undefined; corner?: Corner; message?: string | undefined },
  ): Promise<AxleDesignView> {
    const existing = await this.get(teamId, designId); // 404 outside the team
    return this.orm.transaction(async (tx) => {
      const set: Record<string, unknown> = { revision: sql`${axleDesigns.revision} + 1`, updatedAt: sql`now()`, updatedBy: authorId };
      if (change.name !== undefined) set['name'] = change.name;
      if (change.archived !== undefined) set['archived'] = change.archived;
      if (change.corner !== undefined) {
        set['corner'] = change.corner;
        set['status'] = 'draft';
      }
      const [row] = await tx
        .update(axleDesigns)
        .set(set)
        .where(and(eq(axleDesigns.id, existing.id), eq(axleDesigns.revision, baseRevision)))
        .returning();
      if (!row) throw staleRevision(baseRevision, await this.get(teamId, designId, tx));
      await tx.insert(axleDesignRevisions).values({
        designId,
        revision: row.revision,
        name: row.name,
        status: row.status,
        archived: row.archived,
        corner: row.corner,
        message: change.message ?? null,
        authorId,
      });
      await recordActivity(tx, {
        teamId,
        actorId: authorId,
        action: change.corner !== undefined ? 'design.corner' : 'design.update',
        subjectType: 'axle_design',
        subjectId: designId,
        designId,
        summary: `Axle design "${row.name}" revision ${row.revision}: ${changeWords(change, 'corner')}${change.message ? ` (${change.message})` : ''}`,
      });
      return this.get(teamId, designId, tx);
    });
  }

  /**
   * Reads an uploaded hardpoint file against the design's current corner:
   * every bad row named (400 `import_rows`), the merged corner checked by the
   * corner schema (400 `import_geometry`), and nothing saved either way.
   * `options.corner` is the editor's working corner (unsaved edits), merged
   * into instead of the stored one so the preview shows what the user has.
   */
  async previewImport(
    teamId: string,
    designId: string,
    file: { name: string; text: string },
    options: { frame?: CadFrame | undefined; corner?: Corner | undefined } = {},
  ): Promise<ImportPreview> {
    const design = await this.get(teamId, designId);
    const stored = parseCorner(design.corner);
    if (options.corner && options.corner.type !== stored.type) {
      throw new HttpError(400, 'invalid_input', `Invalid upload fields: corner: this design is a ${stored.type}, not a ${options.corner.type}`, {
        fields: [{ path: 'corner.type', message: `must be ${stored.type}` }],
      });
    }
    const prepared = prepareHardpointImport(options.corner ?? stored, file.name, file.text, options.frame);
    if (!prepared.ok) {
      const n = prepared.errors.length;
      throw new HttpError(400, 'import_rows', `${file.name} cannot be imported: ${prepared.errors[0]}${n > 1 ? ` (and ${n - 1} more)` : ''}`, {
        errors: prepared.errors,
      });
    }
    try {
      const corner = parseCorner(prepared.corner);
      return { corner, changedPoints: prepared.changedPoints, warnings: prepared.warnings, baseRevision: design.revision };
    } catch (e) {
      if (!(e instanceof HttpError) || e.code !== 'invalid_input') throw e;
      const fields = (e.details as { fields: { path: string; message: string }[] }).fields;
      throw new HttpError(400, 'import_geometry', `The imported points break the corner: ${fields[0] ? `${fields[0].path}: ${fields[0].message}` : e.message}`, {
        fields,
        changedPoints: prepared.changedPoints,
      });
    }
  }

  async revisions(teamId: string, designId: string): Promise<(RevisionRow & { status: DesignStatus })[]> {
    await this.get(teamId, designId);
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
      .where(eq(axleDesignRevisions.designId, designId))
      .orderBy(desc(axleDesignRevisions.revision));
  }

  async revision(teamId: string, designId: string, revision: number) {
    await this.get(teamId, designId);
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
      .where(and(eq(axleDesignRevisions.designId, designId), eq(axleDesignRevisions.revision, revision)));
    if (!r) throw notFound('Revision');
    return { ...r, corner: upgradeCornerDocument(r.corner) };
  }
}
