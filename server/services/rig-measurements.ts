/**
 * Rig measurements: a bump-steer rig file read with a column mapping
 * (shared/io/rig-measurement.ts), stored whole or not at all against a
 * configuration revision's front or rear axle design, or against an axle
 * design revision as a baseline of the current car, and compared with the
 * design's predicted toe and camber (shared/rig/compare.ts, run in
 * the compute pool). The comparison is recomputed on every read with the
 * team's current rig tolerance; nothing computed is stored or taken from
 * the browser.
 */
import type { DisplayUnits } from '../../shared/api/accounts.js';
import { and, desc, eq, type SQL } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { axleDesignRevisions, axleDesigns, rigMeasurements, teamRigSettings, users, vehicles } from '../db/schema.js';
import { DomainError, notFound } from '../../shared/errors.js';
import type { ComputePool } from '../compute/pool.js';
import type { Configurations } from './configurations.js';
import { recordActivity } from './activity.js';
import type { UploadedText } from '../http/upload.js';
import { previewRigCsv, readRigCsv, type RigMapping, type RigPoint, type RigPreview } from '../../shared/io/rig-measurement.js';
import { DEFAULT_RIG_TOLERANCE, type RigBasis, type RigComparison, type RigTolerance } from '../../shared/rig/compare.js';
import { upgradeCornerDocument } from '../../shared/schema/corner.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import type { AxleName } from '../../shared/schema/axle.js';
import type { RigToleranceView as RigToleranceWire } from '../../shared/api/rig.js';

/** What a measurement is compared with. */
export type RigTarget =
  | { kind: 'configuration'; configurationId: string; configurationRevision?: number | undefined; axle: AxleName }
  | { kind: 'baseline'; designId: string; designRevision?: number | undefined };

export interface RigOptions {
  name?: string | undefined;
  note?: string | undefined;
  side: 'left' | 'right';
  rackMm: number;
  basis: RigBasis;
}

/** The team's tolerance (`updatedAt` still a Date). */
export type RigToleranceView = Omit<RigToleranceWire, 'updatedAt'> & { updatedAt: Date | null };

const rowErrors = (errors: string[]) =>
  new DomainError('invalid', 'rig_rows', `The rig file was refused: ${errors[0]}${errors.length > 1 ? ` (and ${errors.length - 1} more)` : ''}`, { errors });

/** A measurement's row without its points: what the list shows and the `:measurementId` loader gives. */
export type RigMeasurementSummary = Awaited<ReturnType<RigMeasurements['list']>>[number];

const summaryColumns = {
  id: rigMeasurements.id,
  name: rigMeasurements.name,
  fileName: rigMeasurements.fileName,
  attachedTo: rigMeasurements.attachedTo,
  configurationId: rigMeasurements.configurationId,
  configurationRevision: rigMeasurements.configurationRevision,
  axle: rigMeasurements.axle,
  designId: rigMeasurements.designId,
  designName: axleDesigns.name,
  designRevision: rigMeasurements.designRevision,
  side: rigMeasurements.side,
  rackMm: rigMeasurements.rackMm,
  basis: rigMeasurements.basis,
  pointCount: rigMeasurements.pointCount,
  hasCamber: rigMeasurements.hasCamber,
  note: rigMeasurements.note,
  authorName: users.displayName,
  createdAt: rigMeasurements.createdAt,
};

export class RigMeasurements {
  constructor(
    private readonly orm: Orm,
    private readonly configurations: Configurations,
    private readonly pool: ComputePool,
    private readonly computeTimeLimitMs: number,
  ) {}

  /** The columns, first rows and a proposed mapping of an uploaded file; nothing stored. */
  preview(file: UploadedText): RigPreview & { fileName: string } {
    const r = previewRigCsv(file.text);
    if (!r.ok) throw rowErrors(r.errors);
    return { fileName: file.name, ...r.preview };
  }

  async tolerance(teamId: string): Promise<RigToleranceView> {
    const [row] = await this.orm
      .select({ toeDeg: teamRigSettings.toeToleranceDeg, camberDeg: teamRigSettings.camberToleranceDeg, updatedAt: teamRigSettings.updatedAt, updatedByName: users.displayName })
      .from(teamRigSettings)
      .leftJoin(users, eq(users.id, teamRigSettings.updatedBy))
      .where(eq(teamRigSettings.teamId, teamId));
    if (!row) return { ...DEFAULT_RIG_TOLERANCE, isDefault: true, updatedAt: null, updatedByName: null };
    return { toeDeg: row.toeDeg, camberDeg: row.camberDeg, isDefault: false, updatedAt: row.updatedAt, updatedByName: row.updatedByName ?? null };
  }

  async setTolerance(teamId: string, userId: string, t: RigTolerance): Promise<RigToleranceView> {
    await this.orm.transaction(async (tx) => {
      const values = { teamId, toeToleranceDeg: t.toeDeg, camberToleranceDeg: t.camberDeg, updatedBy: userId, updatedAt: new Date() };
      await tx.insert(teamRigSettings).values(values).onConflictDoUpdate({ target: teamRigSettings.teamId, set: values });
      await recordActivity(tx, {
        teamId,
        actorId: userId,
        action: 'rig.tolerance',
        subjectType: 'team',
        subjectId: teamId,
        summary: `Rig tolerance set to toe ${t.toeDeg}°, camber ${t.camberDeg}°`,
      });
    });
    return this.tolerance(teamId);
  }

  /** The design revision and corner a target stands for (404 for another team's). */
  private async resolveTarget(teamId: string, target: RigTarget) {
    if (target.kind === 'configuration') {
      const c = await this.configurations.inputs(await this.configurations.get(teamId, target.configurationId), target.configurationRevision);
      const designId = target.axle === 'front' ? c.refs.frontDesignId : c.refs.rearDesignId;
      const designRevision = target.axle === 'front' ? c.refs.frontDesignRevision : c.refs.rearDesignRevision;
      const corner = target.axle === 'front' ? c.inputs.frontCorner : c.inputs.rearCorner;
      return { configurationId: target.configurationId, configurationRevision: c.revision, axle: target.axle, designId, designRevision, corner };
    }
    const [d] = await this.orm
      .select({ id: axleDesigns.id, axle: axleDesigns.axle, revision: axleDesigns.revision })
      .from(axleDesigns)
      .innerJoin(vehicles, eq(vehicles.id, axleDesigns.vehicleId))
      .where(and(eq(axleDesigns.id, target.designId), eq(vehicles.teamId, teamId)));
    if (!d) throw notFound('Axle design');
    const revision = target.designRevision ?? d.revision;
    const corner = await this.designCorner(d.id, revision);
    return { configurationId: null, configurationRevision: null, axle: d.axle, designId: d.id, designRevision: revision, corner };
  }

  private async designCorner(designId: string, revision: number): Promise<unknown> {
    const [r] = await this.orm
      .select({ corner: axleDesignRevisions.corner })
      .from(axleDesignRevisions)
      .where(and(eq(axleDesignRevisions.designId, designId), eq(axleDesignRevisions.revision, revision)));
    if (!r) throw new DomainError('not_found', 'not_found', `Axle design revision ${revision} not found`, { field: 'designRevision' });
    return upgradeCornerDocument(r.corner);
  }

  private compare(corner: unknown, points: RigPoint[], o: { rackMm: number; side: 'left' | 'right'; basis: RigBasis }, tolerance: RigTolerance, units: DisplayUnits = 'si'): Promise<RigComparison> {
    const t = { toeDeg: tolerance.toeDeg, camberDeg: tolerance.camberDeg };
    return this.pool.run('rig-compare', { corner, points, rackMm: o.rackMm, side: o.side, basis: o.basis, tolerance: t, units }, { timeLimitMs: this.computeTimeLimitMs }) as Promise<RigComparison>;
  }

  /**
   * Reads the file with the mapping, checks the target, compares (so a file
   * the design cannot reach, or a rack outside the stroke, is refused before
   * anything is written) and stores points, mapping and activity in one
   * transaction.
   */
  async create(teamId: string, userId: string, file: UploadedText, mapping: RigMapping, target: RigTarget, o: RigOptions) {
    const read = readRigCsv(file.text, mapping);
    if (!read.ok) throw rowErrors(read.errors);
    const t = await this.resolveTarget(teamId, target);
    const tolerance = await this.tolerance(teamId);
    const comparison = await this.compare(t.corner, read.points, o, tolerance);
    const name = o.name?.trim() || file.name;
    const id = await this.orm.transaction(async (tx) => {
      const [row] = await tx
        .insert(rigMeasurements)
        .values({
          teamId,
          name,
          fileName: file.name,
          attachedTo: target.kind,
          configurationId: t.configurationId,
          configurationRevision: t.configurationRevision,
          axle: t.axle,
          designId: t.designId,
          designRevision: t.designRevision,
          side: o.side,
          rackMm: o.rackMm,
          basis: o.basis,
          mapping,
          points: read.points,
          pointCount: read.points.length,
          hasCamber: read.hasCamber,
          note: o.note?.trim() || null,
          authorId: userId,
        })
        .returning({ id: rigMeasurements.id });
      await recordActivity(tx, {
        teamId,
        actorId: userId,
        action: 'rig.create',
        subjectType: t.configurationId ? 'configuration' : 'axle_design',
        subjectId: t.configurationId ?? t.designId,
        designId: t.designId,
        summary: `Rig measurement "${name}" (${read.points.length} points, ${t.axle} axle, design revision ${t.designRevision}) stored: toe RMS ${comparison.toe.rmsDeg.toFixed(3)}°`,
      });
      return row!.id;
    });
    return { ...(await this.summary(teamId, id)), notes: read.notes, comparison, engineVersion: ENGINE_VERSION };
  }

  async list(teamId: string, filter: { configurationId?: string | undefined; designId?: string | undefined }) {
    const where: SQL[] = [eq(rigMeasurements.teamId, teamId)];
    if (filter.configurationId) where.push(eq(rigMeasurements.configurationId, filter.configurationId));
    if (filter.designId) where.push(eq(rigMeasurements.designId, filter.designId));
    return this.select()
      .where(and(...where))
      .orderBy(desc(rigMeasurements.createdAt), desc(rigMeasurements.id));
  }

  /** Summary rows with the design's name and the author's. */
  private select() {
    return this.orm
      .select(summaryColumns)
      .from(rigMeasurements)
      .innerJoin(axleDesigns, eq(axleDesigns.id, rigMeasurements.designId))
      .leftJoin(users, eq(users.id, rigMeasurements.authorId));
  }

  /** The measurement's summary row, if it is the team's (the `:measurementId` loader). */
  async summary(teamId: string, id: string): Promise<RigMeasurementSummary> {
    const [row] = await this.select().where(and(eq(rigMeasurements.id, id), eq(rigMeasurements.teamId, teamId)));
    if (!row) throw notFound('Rig measurement');
    return row;
  }

  /** One measurement with its mapping and points, and the comparison recomputed now with the team's tolerance (its cautions worded in `units`). */
  async get(teamId: string, s: RigMeasurementSummary, units: DisplayUnits = 'si') {
    const [row] = await this.orm.select({ mapping: rigMeasurements.mapping, points: rigMeasurements.points }).from(rigMeasurements).where(eq(rigMeasurements.id, s.id));
    const points = row!.points;
    const corner = await this.designCorner(s.designId, s.designRevision);
    const tolerance = await this.tolerance(teamId);
    const comparison = await this.compare(corner, points, { rackMm: s.rackMm, side: s.side, basis: s.basis }, tolerance, units);
    return { ...s, mapping: row!.mapping, points, comparison, engineVersion: ENGINE_VERSION };
  }

  async remove(teamId: string, s: RigMeasurementSummary, userId: string): Promise<void> {
    await this.orm.transaction(async (tx) => {
      await tx.delete(rigMeasurements).where(eq(rigMeasurements.id, s.id));
      await recordActivity(tx, {
        teamId,
        actorId: userId,
        action: 'rig.delete',
        subjectType: s.configurationId ? 'configuration' : 'axle_design',
        subjectId: s.configurationId ?? s.designId,
        designId: s.designId,
        summary: `Rig measurement "${s.name}" deleted`,
      });
    });
  }
}
