/**
 * Tolerance studies and design sweeps on the job queue. A request names
 * its target by id; the service loads the documents, builds the
 * self-contained spec (shared/study), cuts it into chunks (planStudy, on the compute pool) and
 * puts one `study-chunk` job per chunk on the queue in the same transaction
 * as the study row. Worker processes run the chunks
 * (server/compute/study-handlers.ts) and combine them when all are in.
 *
 * Fair share (docs/operations.md): a team may have `maxActivePerTeam`
 * studies queued or running at once (more: 429 too_many_studies); chunk k
 * of every study has priority −k, so running studies advance a chunk at a
 * time in turn; solve jobs have their own queue and worker lanes.
 */
import { randomInt } from 'node:crypto';
import { and, desc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import { KEY_FIGURE_OUTPUTS, studyKeyFigures, studyRequestSchema, studyResultCsv, studySpecSchema, variantCorner, withFactorLabels, type StudyPlan, type StudyRequest, type StudyResult, type StudySpec, type KeyFigureSource } from '../../shared/study/index.js';
import type { ComputePool } from '../compute/pool.js';
import type { Database } from '../db/client.js';
import { configurations, programmeTeams, studies, studyAttachments, teams, users } from '../db/schema.js';
import { DomainError, notFound, parseOrThrow } from '../../shared/errors.js';
import type { AxleDesigns } from './axle-designs.js';
import type { Configurations } from './configurations.js';
import type { Proposals, ProposalView } from './proposals.js';
import type { Vehicles } from './vehicles.js';
import type { ProgrammeRow } from './programmes.js';
import { QUEUES, bossDb, inTransaction, type JobQueue, type QueueJobData } from '../compute/queue.js';
import type { AxleName } from '../../shared/schema/axle.js';
import type { DisplayUnits } from '../../shared/api/accounts.js';
import type { AttachedStudy as AttachedStudyWire, StudyResolvedTarget, StudyView as StudyWire } from '../../shared/api/studies.js';

/**
 * A study as the service hands it over: the wire type with its times still Dates (`res.json` writes them as ISO
 * strings), without its result (`answer` writes the study with its result as text).
 */
export type StudyView = Omit<StudyWire, 'createdAt' | 'startedAt' | 'finishedAt' | 'result'> & {
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
};

export interface StudyOptions {
  maxActivePerTeam: number;
  /** Time limit of a submitted study's plan on the compute pool, ms. */
  computeTimeLimitMs: number;
  /** A chunk a worker took and went silent on goes to another worker after this long. */
  chunkExpireSeconds: number;
}

/** The queue job id of chunk `i` of a study: fixed, so a study's chunks can be cancelled by id. */
export function chunkJobId(studyId: string, i: number): string {
  // The study id with its last 8 hex digits replaced by the chunk index (studies have at most 100 000 / 10 chunks).
  const hex = studyId.replace(/-/g, '');
  const h = `${hex.slice(0, 24)}${i.toString(16).padStart(8, '0')}`;
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

type Row = typeof studies.$inferSelect;
/**
 * A study row as the `:studyId` loader gives it, with its creator's name. Without the result as an object:
 * its text (`resultJson`) is what the reader sends, and what an export parses (`resultOf`).
 */
export type StudyRow = Omit<Row, 'result'> & { creatorName: string | null };
const { result: _resultObject, ...rowColumns } = getTableColumns(studies);

const listColumns = {
  id: studies.id,
  teamId: studies.teamId,
  kind: studies.kind,
  label: studies.label,
  status: studies.status,
  target: studies.target,
  seed: studies.seed,
  totalChunks: studies.totalChunks,
  totalSamples: studies.totalSamples,
  doneChunks: studies.doneChunks,
  doneSamples: studies.doneSamples,
  error: studies.error,
  createdBy: studies.createdBy,
  createdAt: studies.createdAt,
  startedAt: studies.startedAt,
  finishedAt: studies.finishedAt,
  creatorName: users.displayName,
};
type ListRow = Pick<Row, Exclude<keyof typeof listColumns, 'creatorName'>> & { creatorName: string | null };

/** A study attached to a configuration's review record, with its key figures (`attachedAt` still a Date). */
export type AttachedStudy = Omit<AttachedStudyWire, 'attachedAt'> & { attachedAt: Date };

export class Studies {
  constructor(
    private readonly db: Database,
    private readonly queue: JobQueue,
    /** Builds a submitted study's model off the event loop (the plan checks it). */
    private readonly pool: ComputePool,
    private readonly deps: { designs: AxleDesigns; vehicles: Vehicles; configurations: Configurations; proposals: Proposals },
    private readonly o: StudyOptions,
  ) {}

  async create(teamId: string, userId: string, body: unknown): Promise<StudyView> {
    const request = parseOrThrow(studyRequestSchema, body, 'study');
    const [{ active } = { active: 0 }] = await this.db.orm
      .select({ active: sql<number>`count(*)::int` })
      .from(studies)
      .where(and(eq(studies.teamId, teamId), inArray(studies.status, ['queued', 'running'])));
    if (active >= this.o.maxActivePerTeam) {
      throw new DomainError(
        'too_many',
        'too_many_studies',
        `Your team already has ${active} studies waiting or running (at most ${this.o.maxActivePerTeam} at once); wait for one to finish or cancel one`,
        { limit: this.o.maxActivePerTeam },
      );
    }
    const { spec, target, targetName } = await this.resolve(teamId, request);
    const plan = (await this.pool.run('study-plan', spec, { timeLimitMs: this.o.computeTimeLimitMs })) as StudyPlan;
    const label = request.label || `${spec.kind === 'tolerance' ? 'Tolerance study' : 'Design sweep'} of ${targetName}, ${plan.totalSamples} ${spec.kind === 'tolerance' ? 'samples' : 'variants'}`;
    const boss = await this.queue.ready();
    const id = (await inTransaction(this.db.pool, async (client) => {
      const ins = await client.query<{ id: string }>(
        `INSERT INTO studies (team_id, kind, label, request, target, spec, seed, total_chunks, total_samples, created_by)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10) RETURNING id`,
        [teamId, spec.kind, label, request, target, spec, spec.seed, plan.chunkCount, plan.totalSamples, userId],
      );
      const studyId = ins.rows[0]!.id;
      const jobs = chunkJobs(studyId, teamId, Array.from({ length: plan.chunkCount }, (_, i) => i), this.o.chunkExpireSeconds);
      for (let i = 0; i < jobs.length; i += 1000) await boss.insert(jobs.slice(i, i + 1000), { db: bossDb(client) });
      await this.queue.notify('wake', client);
      return studyId;
    }))!;
    return this.get(await this.load(teamId, id));
  }

  async list(teamId: string): Promise<StudyView[]> {
    const rows = await this.db.orm
      .select(listColumns)
      .from(studies)
      .leftJoin(users, eq(users.id, studies.createdBy))
      .where(eq(studies.teamId, teamId))
      .orderBy(desc(studies.createdAt))
      .limit(200);
    return rows.map((r) => view(r));
  }

  /** The study without its result (a study being created has none yet); 410 job_gone when its work was lost. */
  get(r: StudyRow): StudyView {
    if (r.error?.code === 'job_gone') throw gone(r);
    return view(r);
  }

  /**
   * The study with its result, as the text of the API's answer `{ "study": … }`: the result's text stored at
   * combine time is written in as it is, never parsed or made again on the event loop. 410 job_gone when its
   * work was lost.
   */
  async answer(r: StudyRow): Promise<string> {
    const study = JSON.stringify(this.get(r));
    const result = r.status === 'completed' ? (r.resultJson ?? (await this.resultJsonOf(r))) : null;
    // The view's text is an object with members: the result goes in as its last member.
    return `{"study":${result === null ? study : `${study.slice(0, -1)},"result":${result}}`}}`;
  }

  /** The result as objects, for the exports; null until the study has completed. */
  async resultOf(r: StudyRow): Promise<StudyResult | null> {
    const text = r.status === 'completed' ? (r.resultJson ?? (await this.resultJsonOf(r))) : null;
    return text === null ? null : (JSON.parse(text) as StudyResult);
  }

  /**
   * The text of a result stored before `result_json` was (migration 0013), or whose factor names were cleared
   * for renaming: built from the stored result once, with the factors named as the engine names them now,
   * and kept for the next reader.
   */
  private async resultJsonOf(r: StudyRow): Promise<string | null> {
    const [row] = await this.db.orm.select({ result: studies.result }).from(studies).where(eq(studies.id, r.id));
    if (!row?.result) return null;
    const text = JSON.stringify(withFactorLabels(row.result, r.spec.corner));
    await this.db.orm
      .update(studies)
      .set({ resultJson: text })
      .where(and(eq(studies.id, r.id), sql`${studies.resultJson} IS NULL`));
    return text;
  }

  /** Cancels a queued or running study; returns the study as it is then (reloaded). */
  async cancel(teamId: string, r: StudyRow): Promise<StudyRow> {
    const id = r.id;
    if (r.status !== 'queued' && r.status !== 'running') return r;
    const [updated] = await this.db.orm
      .update(studies)
      .set({ status: 'cancelled', finishedAt: new Date() })
      .where(and(eq(studies.id, id), inArray(studies.status, ['queued', 'running'])))
      .returning({ id: studies.id });
    if (updated) await cancelStudyChunks(this.queue, id, r.totalChunks);
    return this.load(teamId, id);
  }

  /** The result as CSV in `units` (the caller's choice, else their account's); the API's JSON stays SI. */
  async csv(r: StudyRow, units: DisplayUnits): Promise<{ filename: string; text: string }> {
    if (r.error?.code === 'job_gone') throw gone(r);
    const result = await this.resultOf(r);
    if (!result) throw new DomainError('conflict', 'study_not_completed', 'The study has no result yet; export it once it has completed');
    const slug = r.label.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'study';
    return { filename: `${slug}.csv`, text: studyResultCsv(r.spec, result, units) };
  }

  /** Opens variant `index` of a completed design sweep as a proposal on the studied axle design. */
  async proposeVariant(teamId: string, r: StudyRow, index: number, userId: string): Promise<ProposalView> {
    if (r.kind !== 'sweep') throw new DomainError('conflict', 'not_a_sweep', 'Only a design sweep has variants to propose');
    if (r.status !== 'completed') throw new DomainError('conflict', 'study_not_completed', 'The sweep has not completed yet');
    const t = r.target;
    const corner = variantCorner(r.spec, index);
    return this.deps.proposals.create(teamId, await this.deps.designs.get(teamId, t.designId), userId, {
      corner,
      baseRevision: t.revision,
      message: `Variant ${index + 1} of "${r.label}"`,
      origin: { studyId: r.id, variant: index },
    });
  }

  /** Attaches a completed study to a configuration of the same team (idempotent: attaching again updates the note). */
  async attach(teamId: string, r: StudyRow, configurationId: string, userId: string, note: string): Promise<AttachedStudy> {
    const id = r.id;
    // A study completes with its result, in one statement (study-handlers.ts).
    if (r.status !== 'completed') throw new DomainError('conflict', 'study_not_completed', 'Only a completed study can be attached to a configuration');
    const [c] = await this.db.orm.select({ id: configurations.id }).from(configurations).where(and(eq(configurations.id, configurationId), eq(configurations.teamId, teamId)));
    if (!c) throw notFound('Configuration');
    await this.db.orm
      .insert(studyAttachments)
      .values({ studyId: id, configurationId, teamId, note, attachedBy: userId })
      .onConflictDoUpdate({ target: [studyAttachments.studyId, studyAttachments.configurationId], set: { note } });
    const list = await this.attachedTo(teamId, configurationId);
    return list.find((a) => a.studyId === id)!;
  }

  async detach(teamId: string, r: StudyRow, configurationId: string): Promise<void> {
    const id = r.id;
    const gone = await this.db.orm
      .delete(studyAttachments)
      .where(and(eq(studyAttachments.studyId, id), eq(studyAttachments.configurationId, configurationId), eq(studyAttachments.teamId, teamId)))
      .returning({ studyId: studyAttachments.studyId });
    if (!gone.length) throw notFound('Attachment');
  }

  /** The studies attached to a configuration, newest attachment first, with their key figures. */
  async attachedTo(teamId: string, configurationId: string): Promise<AttachedStudy[]> {
    const rows = await this.db.orm
      .select({ a: studyAttachments, label: studies.label, kind: studies.kind, totalSamples: studies.totalSamples, keyOutputs: keyOutputs(), byName: users.displayName })
      .from(studyAttachments)
      .innerJoin(studies, eq(studies.id, studyAttachments.studyId))
      .leftJoin(users, eq(users.id, studyAttachments.attachedBy))
      .where(and(eq(studyAttachments.teamId, teamId), eq(studyAttachments.configurationId, configurationId)))
      .orderBy(desc(studyAttachments.attachedAt))
      .limit(100);
    return rows.map((r) => attachedView(r));
  }

  /** The programme board's study column: per accepted team, its latest attached study (instructor of the programme only). */
  async programmeStudies(programme: ProgrammeRow): Promise<{ programmeId: string; teams: { teamId: string; teamName: string; configurationName: string | null; study: AttachedStudy | null }[] }> {
    const programmeId = programme.id;
    const members = await this.db.orm
      .select({ teamId: programmeTeams.teamId, teamName: teams.name })
      .from(programmeTeams)
      .innerJoin(teams, eq(teams.id, programmeTeams.teamId))
      .where(and(eq(programmeTeams.programmeId, programmeId), eq(programmeTeams.status, 'accepted')))
      .orderBy(teams.name);
    // Each team's latest attachment to a configuration in use, all teams in one query.
    const latest = members.length
      ? await this.db.orm
          .selectDistinctOn([studyAttachments.teamId], {
            a: studyAttachments,
            label: studies.label,
            kind: studies.kind,
            totalSamples: studies.totalSamples,
            keyOutputs: keyOutputs(),
            byName: users.displayName,
            configurationName: configurations.name,
          })
          .from(studyAttachments)
          .innerJoin(studies, eq(studies.id, studyAttachments.studyId))
          .innerJoin(configurations, eq(configurations.id, studyAttachments.configurationId))
          .leftJoin(users, eq(users.id, studyAttachments.attachedBy))
          .where(and(inArray(studyAttachments.teamId, members.map((m) => m.teamId)), eq(configurations.archived, false)))
          .orderBy(studyAttachments.teamId, desc(studyAttachments.attachedAt))
      : [];
    const byTeam = new Map(latest.map((r) => [r.a.teamId, r]));
    const out = members.map((m) => {
      const r = byTeam.get(m.teamId);
      return { teamId: m.teamId, teamName: m.teamName, configurationName: r?.configurationName ?? null, study: r ? attachedView(r) : null };
    });
    return { programmeId, teams: out };
  }

  /** The study, if it is the team's (the `:studyId` loader). */
  async load(teamId: string, id: string): Promise<StudyRow> {
    const [r] = await this.db.orm
      .select({ study: rowColumns, creatorName: users.displayName })
      .from(studies)
      .leftJoin(users, eq(users.id, studies.createdBy))
      .where(and(eq(studies.id, id), eq(studies.teamId, teamId)));
    if (!r) throw notFound('Study');
    return { ...r.study, creatorName: r.creatorName };
  }

  /** The spec from the request and the target's documents. */
  private async resolve(teamId: string, request: StudyRequest): Promise<{ spec: StudySpec; target: StudyResolvedTarget; targetName: string }> {
    const { target: wanted, trackProfile, ...settings } = request;
    const seed = request.seed ?? randomInt(0, 0x7fff_ffff);
    let docs: { axle: AxleName; corner: unknown; vehicle?: unknown; otherCorner?: unknown; trackProfile: unknown };
    let target: StudyResolvedTarget;
    let targetName: string;
    if ('axleDesignId' in wanted) {
      const d = await this.deps.designs.get(teamId, wanted.axleDesignId);
      const revision = wanted.revision ?? d.revision;
      const corner = revision === d.revision ? d.corner : (await this.deps.designs.revision(teamId, d.id, revision)).corner;
      const v = await this.deps.vehicles.get(teamId, d.vehicleId);
      docs = { axle: d.axle, corner, ...(v.data ? { vehicle: v.data } : {}), trackProfile: trackProfile ?? 'smooth-circuit' };
      target = { axleDesignId: d.id, designId: d.id, revision, axle: d.axle };
      targetName = `${d.name} r${revision}`;
    } else {
      const c = await this.deps.configurations.get(teamId, wanted.configurationId);
      const { revision, refs, inputs } = await this.deps.configurations.inputs(c, wanted.revision);
      const axle = wanted.axle;
      docs = {
        axle,
        corner: axle === 'front' ? inputs.frontCorner : inputs.rearCorner,
        otherCorner: axle === 'front' ? inputs.rearCorner : inputs.frontCorner,
        ...(inputs.vehicle ? { vehicle: inputs.vehicle } : {}),
        trackProfile: trackProfile ?? inputs.trackProfile,
      };
      const designId = axle === 'front' ? refs.frontDesignId : refs.rearDesignId;
      const designRevision = axle === 'front' ? refs.frontDesignRevision : refs.rearDesignRevision;
      // A design sweep's variants are proposed on the design revision the study ran on: `revision` is that one.
      target = { configurationId: c.id, revision: designRevision, axle, designId, designRevision };
      targetName = `${c.name} r${revision} (${axle})`;
    }
    const spec = parseOrThrow(studySpecSchema, { ...settings, ...docs, target: wanted, seed }, 'study');
    return { spec, target, targetName };
  }
}

/** The queue jobs of chunks `indices` of a study (fixed ids: chunkJobId). */
export function chunkJobs(studyId: string, teamId: string, indices: number[], expireInSeconds: number) {
  return indices.map((i) => {
    const data: QueueJobData = { kind: 'study-chunk', studyId, teamId, chunkIndex: i };
    return {
      id: chunkJobId(studyId, i),
      name: QUEUES.studyChunk,
      data,
      // Studies take turns: chunk k of every study before chunk k+1 of any.
      priority: -i,
      // A failure is retried after 1, 2, 4, 8 s: a transient one (PostgreSQL slow to accept a connection on a
      // loaded machine) must not use up the retries in a second and fail the study.
      retryLimit: 4,
      retryDelay: 1,
      retryBackoff: true,
      expireInSeconds,
      deadLetter: QUEUES.lost,
    };
  });
}

/** Cancels the chunk jobs still waiting (by their fixed ids) and tells the workers running one to stop. */
export async function cancelStudyChunks(queue: JobQueue, studyId: string, totalChunks: number): Promise<void> {
  const boss = await queue.ready();
  const ids = Array.from({ length: totalChunks }, (_, i) => chunkJobId(studyId, i));
  for (let i = 0; i < ids.length; i += 1000) await boss.cancel(QUEUES.studyChunk, ids.slice(i, i + 1000));
  await queue.notify(`cancel:${studyId}`);
}

/**
 * The outputs of a stored result that key figures come from (KEY_FIGURE_OUTPUTS), picked out by PostgreSQL:
 * a board of forty teams reads forty small arrays, not forty whole results (about 100 kB each). Null without a
 * result or without any of those outputs.
 */
function keyOutputs() {
  const keys = sql.join(
    KEY_FIGURE_OUTPUTS.map((k) => sql`${k}`),
    sql`, `,
  );
  return sql<KeyFigureSource[] | null>`(SELECT jsonb_agg(jsonb_build_object('key', o->'key', 'label', o->'label', 'unit', o->'unit', 'p5', o->'p5', 'p50', o->'p50', 'p95', o->'p95'))
    FROM jsonb_array_elements(${studies.result}->'outputs') AS o WHERE o->>'key' IN (${keys}))`;
}

function attachedView(r: { a: typeof studyAttachments.$inferSelect; label: string; kind: 'tolerance' | 'sweep'; totalSamples: number; keyOutputs: KeyFigureSource[] | null; byName: string | null }): AttachedStudy {
  return {
    studyId: r.a.studyId,
    configurationId: r.a.configurationId,
    label: r.label,
    kind: r.kind,
    totalSamples: r.totalSamples,
    note: r.a.note,
    attachedAt: r.a.attachedAt,
    attachedBy: r.a.attachedBy ? { id: r.a.attachedBy, displayName: r.byName ?? '' } : null,
    keyFigures: r.keyOutputs ? studyKeyFigures({ outputs: r.keyOutputs }) : [],
  };
}

function gone(r: Pick<Row, 'id' | 'error'>): DomainError {
  return new DomainError('gone', 'job_gone', r.error?.message ?? 'The study was lost', { reason: 'lost', studyId: r.id });
}

function view(r: ListRow): StudyView {
  let etaSeconds: number | null = null;
  if (r.status === 'running' && r.startedAt && r.doneChunks > 0 && r.doneChunks < r.totalChunks) {
    const elapsedS = (Date.now() - r.startedAt.getTime()) / 1000;
    etaSeconds = Math.max(0, Math.round(((r.totalChunks - r.doneChunks) * elapsedS) / r.doneChunks));
  }
  const v: StudyView = {
    id: r.id,
    kind: r.kind,
    label: r.label,
    status: r.status,
    progress: { doneChunks: r.doneChunks, totalChunks: r.totalChunks, doneSamples: r.doneSamples, totalSamples: r.totalSamples },
    etaSeconds,
    error: r.error,
    target: r.target,
    seed: r.seed,
    createdAt: r.createdAt,
    startedAt: r.startedAt,
    finishedAt: r.finishedAt,
    createdBy: r.createdBy ? { id: r.createdBy, displayName: r.creatorName ?? '' } : null,
  };
  return v;
}
