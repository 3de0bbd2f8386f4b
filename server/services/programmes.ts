/**
 * Programmes: an instructor invites teams; a team's owner accepts, which lets
 * the instructor read that team (never write). The board lists every
 * accepted team's configurations — latest revision computed now on the
 * programme's track profile, and the latest approval's frozen figures — with
 * key figures picked from the engines' results. Snapshots freeze the board.
 */
import { and, asc, desc, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { configurations, programmeSnapshots, programmeTeams, programmes, teams, users } from '../db/schema.js';
import { DomainError, notFound } from '../../shared/errors.js';
import type { TrackProfileId } from '../../shared/tracks/profiles.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import type { Configurations, ConfigurationResults } from './configurations.js';
import { toCsv } from '../../shared/io/csv.js';
import { inDisplayUnits } from '../../shared/units/quantities.js';
import type { DisplayUnits } from '../../shared/api/accounts.js';
import type { Board, BoardRow, KeyFigures } from '../../shared/api/programmes.js';

/** A programme as the `:programmeId` loader gives it (its instructor only). */
export type ProgrammeRow = typeof programmes.$inferSelect;

const num = (x: unknown): number | null => (typeof x === 'number' ? x : null);
function pick(o: unknown, path: string[]): unknown {
  let v = o;
  for (const k of path) v = v && typeof v === 'object' ? (v as Record<string, unknown>)[k] : undefined;
  return v;
}

/** Reads the key figures out of a configuration's results (no computation here). */
export function keyFigures(r: ConfigurationResults): KeyFigures {
  return {
    rollSteerFront: num(pick(r.balance, ['kinematicsLink', 'front', 'used', 'rollSteerCoefficient'])),
    rollSteerRear: num(pick(r.balance, ['kinematicsLink', 'rear', 'used', 'rollSteerCoefficient'])),
    rollSteerUndersteerDegPerG: num(pick(r.balance, ['understeerBudget', 'rollSteer'])),
    understeerGradientDegPerG: num(pick(r.balance, ['understeerBudget', 'total'])),
    bumpSteerFrontDegPerM: num(pick(r.bumpSteer, ['front', 'bumpSteerDegPerM'])),
    bumpSteerRearDegPerM: num(pick(r.bumpSteer, ['rear', 'bumpSteerDegPerM'])),
  };
}

const FIGURE_KEYS: (keyof KeyFigures)[] = [
  'rollSteerFront',
  'rollSteerRear',
  'rollSteerUndersteerDegPerG',
  'understeerGradientDegPerG',
  'bumpSteerFrontDegPerM',
  'bumpSteerRearDegPerM',
];

export class Programmes {
  constructor(
    private readonly orm: Orm,
    private readonly configs: Configurations,
  ) {}

  private instructorOnly(user: { instructor: boolean }) {
    if (!user.instructor) throw new DomainError('forbidden', 'forbidden', 'Only instructors run programmes');
  }

  async create(user: { id: string; instructor: boolean }, input: { name: string; trackProfile: TrackProfileId }) {
    this.instructorOnly(user);
    const [p] = await this.orm.insert(programmes).values({ name: input.name, trackProfile: input.trackProfile, instructorId: user.id }).returning();
    return p!;
  }

  async list(user: { id: string }) {
    return this.orm.select().from(programmes).where(eq(programmes.instructorId, user.id)).orderBy(asc(programmes.name));
  }

  /** The programme row, for its instructor only (anyone else: 404); the `:programmeId` loader. */
  async load(user: { id: string }, id: string): Promise<ProgrammeRow> {
    const [p] = await this.orm.select().from(programmes).where(and(eq(programmes.id, id), eq(programmes.instructorId, user.id)));
    if (!p) throw notFound('Programme');
    return p;
  }

  /** The loaded programme with its teams. */
  async get(p: ProgrammeRow) {
    const id = p.id;
    const members = await this.orm
      .select({ teamId: programmeTeams.teamId, teamName: teams.name, teamSlug: teams.slug, status: programmeTeams.status, invitedAt: programmeTeams.invitedAt, decidedAt: programmeTeams.decidedAt })
      .from(programmeTeams)
      .innerJoin(teams, eq(teams.id, programmeTeams.teamId))
      .where(eq(programmeTeams.programmeId, id))
      .orderBy(asc(teams.name));
    return { ...p, teams: members };
  }

  async inviteTeam(p: ProgrammeRow, teamSlug: string) {
    const id = p.id;
    const [t] = await this.orm.select({ id: teams.id }).from(teams).where(eq(teams.slug, teamSlug));
    if (!t) throw new DomainError('not_found', 'not_found', `No team has the address "${teamSlug}"`, { field: 'teamSlug' });
    const rows = await this.orm.insert(programmeTeams).values({ programmeId: id, teamId: t.id }).onConflictDoNothing().returning();
    if (!rows.length) throw new DomainError('conflict', 'already_invited', 'That team is already in this programme');
    return (await this.get(p)).teams.find((x) => x.teamId === t.id)!;
  }

  /** A team's programme invitations, for its owner. */
  async forTeam(teamId: string) {
    return this.orm
      .select({ programmeId: programmes.id, name: programmes.name, instructorName: users.displayName, trackProfile: programmes.trackProfile, status: programmeTeams.status, invitedAt: programmeTeams.invitedAt })
      .from(programmeTeams)
      .innerJoin(programmes, eq(programmes.id, programmeTeams.programmeId))
      .leftJoin(users, eq(users.id, programmes.instructorId))
      .where(eq(programmeTeams.teamId, teamId))
      .orderBy(desc(programmeTeams.invitedAt));
  }

  async decide(teamId: string, programmeId: string, userId: string, status: 'accepted' | 'declined') {
    const rows = await this.orm
      .update(programmeTeams)
      .set({ status, decidedAt: new Date(), decidedBy: userId })
      .where(and(eq(programmeTeams.teamId, teamId), eq(programmeTeams.programmeId, programmeId)))
      .returning();
    if (!rows.length) throw notFound('Programme invitation');
    return rows[0]!;
  }

  /** True when the user instructs a programme this team accepted: read access to the team. */
  async instructorReads(userId: string, teamId: string): Promise<boolean> {
    const [r] = await this.orm
      .select({ teamId: programmeTeams.teamId })
      .from(programmeTeams)
      .innerJoin(programmes, eq(programmes.id, programmeTeams.programmeId))
      .where(and(eq(programmeTeams.teamId, teamId), eq(programmeTeams.status, 'accepted'), eq(programmes.instructorId, userId)))
      .limit(1);
    return !!r;
  }

  async board(programme: ProgrammeRow): Promise<Board> {
    const id = programme.id;
    const p = await this.get(programme);
    const rows: BoardRow[] = [];
    for (const t of p.teams.filter((x) => x.status === 'accepted')) {
      const list = await this.orm
        .select({ id: configurations.id, name: configurations.name, status: configurations.status, revision: configurations.revision })
        .from(configurations)
        .where(and(eq(configurations.teamId, t.teamId), eq(configurations.archived, false)))
        .orderBy(asc(configurations.name));
      for (const c of list) {
        let latest: BoardRow['latest'];
        try {
          const { inputs } = await this.configs.inputs(c);
          latest = { revision: c.revision, trackProfile: p.trackProfile, figures: keyFigures(await this.configs.compute({ ...inputs, trackProfile: p.trackProfile })) };
        } catch (err) {
          latest = { revision: c.revision, error: err instanceof Error ? err.message : String(err) };
        }
        const [a] = await this.configs.approvals(c);
        let approved: BoardRow['approved'] = null;
        if (a) {
          const full = await this.configs.frozen(c, a.id);
          approved = { revision: a.revision, approvedAt: a.approvedAt.toISOString(), engineVersion: a.engineVersion, trackProfile: full.trackProfile, figures: keyFigures(full.results) };
        }
        rows.push({ teamId: t.teamId, teamName: t.teamName, configurationId: c.id, configurationName: c.name, status: c.status, latest, approved });
      }
    }
    return { programmeId: id, trackProfile: p.trackProfile, engineVersion: ENGINE_VERSION, rows };
  }

  async snapshot(user: { id: string }, p: ProgrammeRow, label?: string) {
    const board = await this.board(p);
    const [s] = await this.orm.insert(programmeSnapshots).values({ programmeId: p.id, label: label ?? null, board, takenBy: user.id }).returning();
    return s!;
  }

  async snapshots(p: ProgrammeRow) {
    const id = p.id;
    return this.orm
      .select({ id: programmeSnapshots.id, label: programmeSnapshots.label, takenAt: programmeSnapshots.takenAt })
      .from(programmeSnapshots)
      .where(eq(programmeSnapshots.programmeId, id))
      .orderBy(desc(programmeSnapshots.takenAt));
  }

  async snapshotById(p: ProgrammeRow, snapshotId: string) {
    const id = p.id;
    const [s] = await this.orm.select().from(programmeSnapshots).where(and(eq(programmeSnapshots.id, snapshotId), eq(programmeSnapshots.programmeId, id)));
    if (!s) throw notFound('Snapshot');
    return s;
  }

  /**
   * The snapshot as CSV: one line per configuration, latest and approved figures side by side, in the reader's
   * units: bump steer per inch for an inch-pound reader (the column says so, `…DegPerIn`); the other figures
   * (deg/deg, deg/g) read the same in both systems.
   */
  static csv(board: Board, units: DisplayUnits = 'si'): string {
    const perLength = (k: keyof KeyFigures) => k.endsWith('DegPerM');
    const column = (k: keyof KeyFigures) => (units === 'imperial' && perLength(k) ? k.replace(/DegPerM$/, 'DegPerIn') : k);
    const figure = (k: keyof KeyFigures, v: number | null | undefined) => (v === null || v === undefined ? null : perLength(k) ? inDisplayUnits(v, 'bumpSteer', units) : v);
    const header = [
      'team',
      'configuration',
      'status',
      'latest_revision',
      ...FIGURE_KEYS.map((k) => `latest_${column(k)}`),
      'approved_revision',
      'approved_at_utc',
      ...FIGURE_KEYS.map((k) => `approved_${column(k)}`),
    ];
    const rows = board.rows.map((r) => {
      const lf = 'figures' in r.latest ? r.latest.figures : null;
      return [
        r.teamName,
        r.configurationName,
        r.status,
        r.latest.revision,
        ...FIGURE_KEYS.map((k) => figure(k, lf?.[k])),
        r.approved?.revision ?? null,
        r.approved ? new Date(r.approved.approvedAt).toISOString() : null,
        ...FIGURE_KEYS.map((k) => figure(k, r.approved?.figures[k])),
      ];
    });
    return toCsv(header, rows);
  }
}
