/**
 * Idempotent seed of the invented demo scenario (docs: team-rules "Demo
 * scenario"): creates whatever is missing and leaves existing rows alone, so
 * it can run at every start without undoing what demo users changed.
 * Never run in production.
 */
import { randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { and, eq, inArray, sql } from 'drizzle-orm';
import type { Orm } from './client.js';
import { axleDesignRevisions, axleDesigns, configurations, memberships, teams, users, vehicleRevisions, vehicles } from './schema.js';
import type { Role } from '../permissions.js';
import type { ComputePool } from '../compute/pool.js';
import { deserializeError, type TaskKind } from '../compute/tasks.js';
import { ReviewGates } from '../services/review-gates.js';
import runComputeTask from '../compute/worker.js';
import { Configurations, type ReviewAction } from '../services/configurations.js';
import { Accounts } from '../services/accounts.js';
import { Invitations } from '../services/invitations.js';
import type { TrackProfileId } from '../../shared/tracks/profiles.js';
import { exampleVehicles, type ExampleVehicleName } from '../../shared/balance/examples.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import type { Corner } from '../../shared/schema/corner.js';
import type { AxleName } from '../../shared/schema/axle.js';

export const DEMO_PASSWORD = 'demo-pass-2026';

export const DEMO_USERS = [
  { email: 'owner@tallowmere.example', displayName: 'Ana Ferreira' },
  { email: 'engineer@tallowmere.example', displayName: 'Eli Marsh' },
  { email: 'designer@tallowmere.example', displayName: 'Dana Quist' },
  { email: 'reviewer@tallowmere.example', displayName: 'Ravi Osei' },
  { email: 'viewer@tallowmere.example', displayName: 'Vera Nyman' },
  { email: 'owner@brackenfield.example', displayName: 'Bo Halvorsen' },
  { email: 'reviewer@brackenfield.example', displayName: 'Kit Amadi' },
  { email: 'instructor@programme.example', displayName: 'Iris Calder', instructor: true },
] as const;

/** Moves a corner's tie-rod / toe-link inner point up by dz mm: the usual roll-steer variant. */
function raiseSteeringInner(corner: Corner, dzMm: number): Corner {
  const c = structuredClone(corner) as Corner & { points: Record<string, [number, number, number]>; toeLink?: number };
  const key = c.type === 'five-link' ? `link${c.toeLink ?? 5}Inner` : 'tieRodInner';
  const p = c.points[key];
  if (!p) throw new Error(`example corner has no ${key}`);
  c.points[key] = [p[0], p[1], p[2] + dzMm];
  return c;
}

const C = exampleCorners;

interface DemoDesign {
  axle: AxleName;
  name: string;
  corner: Corner;
}

/** A demo configuration and the review steps it has been through (each by a demo member, through the configurations service). */
interface DemoConfiguration {
  name: string;
  vehicle: string;
  front: string;
  rear: string;
  trackProfile: TrackProfileId;
  author: string;
  message: string;
  /** `acknowledge`: with a sign-off, the reason written against each Critical caution the gate asks about. */
  steps: { action: ReviewAction; by: string; message?: string; acknowledge?: string }[];
  comments?: { by: string; body: string; resultRef?: string }[];
}

interface DemoTeam {
  slug: string;
  name: string;
  members: { email: string; roles: Role[] }[];
  vehicles: { example: ExampleVehicleName; designs: DemoDesign[] }[];
  configurations: DemoConfiguration[];
}

export const DEMO_TEAMS: DemoTeam[] = [
  {
    slug: 'tallowmere',
    name: 'Tallowmere University Racing',
    members: [
      { email: 'owner@tallowmere.example', roles: ['owner'] },
      { email: 'engineer@tallowmere.example', roles: ['engineer'] },
      { email: 'designer@tallowmere.example', roles: ['designer'] },
      { email: 'reviewer@tallowmere.example', roles: ['reviewer'] },
      { email: 'viewer@tallowmere.example', roles: ['viewer'] },
    ],
    vehicles: [
      {
        example: 'tur26Ember',
        designs: [
          { axle: 'front', name: 'Front baseline', corner: C.fsFrontWishbone },
          { axle: 'rear', name: 'Rear baseline', corner: C.fsRearWishbone },
          { axle: 'rear', name: 'Rear, toe link inner +6 mm', corner: raiseSteeringInner(C.fsRearWishbone, 6) },
        ],
      },
      {
        example: 'tur25Cinder',
        designs: [
          { axle: 'front', name: 'Front 2025', corner: C.fsFrontWishbone },
          { axle: 'rear', name: 'Rear 2025', corner: C.fsRearWishbone },
        ],
      },
    ],
    configurations: [
      {
        name: 'Ember baseline',
        vehicle: 'TUR-26 Ember',
        front: 'Front baseline',
        rear: 'Rear baseline',
        trackProfile: 'smooth-circuit',
        author: 'designer@tallowmere.example',
        message: 'Baseline for the 2026 season',
        steps: [
          { action: 'submit', by: 'designer@tallowmere.example', message: 'Baseline as built' },
          {
            action: 'approve',
            by: 'reviewer@tallowmere.example',
            message: 'Balance as intended for the smooth circuits',
            acknowledge: 'Reviewed at the chassis meeting: accepted for the smooth circuits, to be checked on the rig before release',
          },
        ],
      },
      {
        name: 'Ember, rear toe link +6 mm',
        vehicle: 'TUR-26 Ember',
        front: 'Front baseline',
        rear: 'Rear, toe link inner +6 mm',
        trackProfile: 'bumpy-circuit',
        author: 'designer@tallowmere.example',
        message: 'More rear roll understeer for the bumpy tracks',
        steps: [{ action: 'submit', by: 'designer@tallowmere.example', message: 'Please check the rear roll-steer term' }],
        comments: [{ by: 'reviewer@tallowmere.example', body: 'Looking at the roll-steer term of the budget first.', resultRef: 'budget' }],
      },
      {
        name: 'Cinder carry-over',
        vehicle: 'TUR-25 Cinder',
        front: 'Front 2025',
        rear: 'Rear 2025',
        trackProfile: 'smooth-circuit',
        author: 'engineer@tallowmere.example',
        message: 'Last year’s car as a reference',
        steps: [],
      },
    ],
  },
  {
    slug: 'brackenfield',
    name: 'Brackenfield Road Programme',
    members: [
      { email: 'owner@brackenfield.example', roles: ['owner', 'engineer', 'designer'] },
      { email: 'reviewer@brackenfield.example', roles: ['reviewer'] },
      { email: 'engineer@tallowmere.example', roles: ['engineer'] },
    ],
    vehicles: [
      {
        example: 'brackenfieldB3',
        designs: [
          { axle: 'front', name: 'Front strut baseline', corner: C.roadFrontStrut },
          { axle: 'rear', name: 'Rear five-link baseline', corner: C.roadRearFiveLink },
        ],
      },
      {
        example: 'brackenfieldB5',
        designs: [
          { axle: 'front', name: 'Front strut baseline', corner: C.roadFrontStrut },
          { axle: 'rear', name: 'Rear five-link baseline', corner: C.roadRearFiveLink },
          { axle: 'rear', name: 'Rear, toe link inner +4 mm', corner: raiseSteeringInner(C.roadRearFiveLink, 4) },
        ],
      },
    ],
    configurations: [
      {
        name: 'B3 road baseline',
        vehicle: 'Brackenfield B3 hatchback',
        front: 'Front strut baseline',
        rear: 'Rear five-link baseline',
        trackProfile: 'rough-road',
        author: 'owner@brackenfield.example',
        message: 'Production baseline',
        steps: [
          { action: 'submit', by: 'owner@brackenfield.example' },
          {
            action: 'approve',
            by: 'reviewer@brackenfield.example',
            message: 'Road baseline agreed',
            acknowledge: 'Reviewed at the chassis meeting: accepted for the road baseline, to be checked on the rig before release',
          },
        ],
      },
    ],
  },
];

/** The compute pool's tasks run in this process: the seed runs once at start, before the server's worker pool exists. */
async function runInProcess(kind: TaskKind, input: unknown, asJson: boolean): Promise<unknown> {
  const out = await runComputeTask({ kind, input, asJson });
  if (!out.ok) throw deserializeError(out.error);
  return 'json' in out ? out.json : out.result;
}
const inProcessPool: ComputePool = {
  run: (kind, input) => runInProcess(kind, input, false),
  runJson: async (kind, input) => (await runInProcess(kind, input, true)) as string,
  async close() {},
};

/**
 * `publicUrl` is what the review mails of the demo configurations link to
 * (default PUBLIC_URL, else the development address).
 */
export async function seedDemo(orm: Orm, o: { bcryptRounds?: number; publicUrl?: string } = {}): Promise<void> {
  const publicUrl = o.publicUrl ?? process.env['PUBLIC_URL'] ?? 'http://127.0.0.1:4200';
  await orm.transaction(async (tx) => {
    // One advisory lock: two servers starting together seed once.
    await tx.execute('SELECT pg_advisory_xact_lock(742001)');
    const emails = DEMO_USERS.map((u) => u.email);
    const existing = await tx.select({ email: users.email }).from(users).where(inArray(users.email, emails));
    const missing = DEMO_USERS.filter((u) => !existing.some((e) => e.email === u.email));
    if (missing.length) {
      const passwordHash = await bcrypt.hash(DEMO_PASSWORD, o.bcryptRounds ?? 12);
      await tx
        .insert(users)
        .values(missing.map((u) => ({ email: u.email, displayName: u.displayName, passwordHash, instructor: 'instructor' in u && u.instructor })))
        .onConflictDoNothing();
    }
    // The demo addresses are the seed's own invention: they count as confirmed.
    await tx.update(users).set({ emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())` }).where(inArray(users.email, emails));
    const userRows = await tx.select({ id: users.id, email: users.email }).from(users).where(inArray(users.email, emails));
    const userId = new Map(userRows.map((u) => [u.email, u.id]));
    const ownerOf = (t: DemoTeam) => userId.get(t.members[0]!.email)!;

    // People join a team only by accepting an invitation, the demo's people too (no mail: they accept at once).
    const invitations = new Invitations(tx, new Accounts(tx, o.bcryptRounds ?? 12), {
      secret: randomBytes(32).toString('hex'),
      publicUrl,
      ttlMs: 3_600_000,
    });
    for (const t of DEMO_TEAMS) {
      const created = await tx.insert(teams).values({ slug: t.slug, name: t.name }).onConflictDoNothing().returning({ id: teams.id });
      const [team] = await tx.select({ id: teams.id }).from(teams).where(eq(teams.slug, t.slug));
      if (!team) throw new Error(`seed: team ${t.slug} missing`);
      if (created.length) {
        // The first member created the team (its owner), and invited the others, who accepted.
        const [first, ...others] = t.members;
        await tx.insert(memberships).values({ teamId: team.id, userId: userId.get(first!.email)!, roles: first!.roles });
        for (const m of others) {
          const inv = await invitations.create(team.id, userId.get(first!.email)!, { email: m.email, roles: m.roles }, { mail: false });
          await invitations.acceptForSeed(inv.id, { userId: userId.get(m.email)!, email: m.email });
        }
      }

      const author = ownerOf(t);
      for (const v of t.vehicles) {
        const data = exampleVehicles[v.example];
        let [vehicle] = await tx
          .select({ id: vehicles.id })
          .from(vehicles)
          .where(and(eq(vehicles.teamId, team.id), eq(vehicles.name, data.name ?? v.example)));
        if (!vehicle) {
          [vehicle] = await tx
            .insert(vehicles)
            .values({ teamId: team.id, name: data.name ?? v.example, data, updatedBy: author })
            .returning({ id: vehicles.id });
          await tx.insert(vehicleRevisions).values({ vehicleId: vehicle!.id, revision: 1, name: data.name ?? v.example, archived: false, data, message: 'Demo data', authorId: author });
        }
        const designRows = await tx.select({ name: axleDesigns.name }).from(axleDesigns).where(eq(axleDesigns.vehicleId, vehicle!.id));
        for (const d of v.designs) {
          if (designRows.some((r) => r.name === d.name)) continue;
          const [row] = await tx
            .insert(axleDesigns)
            .values({ vehicleId: vehicle!.id, axle: d.axle, name: d.name, corner: d.corner, updatedBy: author })
            .returning();
          await tx.insert(axleDesignRevisions).values({
            designId: row!.id,
            revision: 1,
            name: d.name,
            status: row!.status,
            archived: false,
            corner: d.corner,
            message: 'Demo data',
            authorId: author,
          });
        }
      }
      await seedConfigurations(tx, team.id, t, userId, publicUrl);
    }
  });
}

/**
 * The team's demo configurations that are missing (matched by name), made
 * and walked through review by the configurations service itself, so their
 * states, transitions, approval snapshots, activity and review mails are
 * what the app would have written. Runs inside the seed's transaction (the
 * service's own transactions become savepoints).
 */
async function seedConfigurations(tx: Orm, teamId: string, t: DemoTeam, userId: Map<string, string>, publicUrl: string): Promise<void> {
  if (t.configurations.length === 0) return;
  const existing = await tx.select({ name: configurations.name }).from(configurations).where(eq(configurations.teamId, teamId));
  const service = new Configurations(tx, inProcessPool, 60_000, publicUrl);
  const roles = new Map(t.members.map((m) => [m.email, m.roles]));
  for (const c of t.configurations) {
    if (existing.some((e) => e.name === c.name)) continue;
    const [vehicle] = await tx.select({ id: vehicles.id }).from(vehicles).where(and(eq(vehicles.teamId, teamId), eq(vehicles.name, c.vehicle)));
    if (!vehicle) throw new Error(`seed: vehicle ${c.vehicle} missing`);
    const designs = await tx.select({ id: axleDesigns.id, name: axleDesigns.name, axle: axleDesigns.axle }).from(axleDesigns).where(eq(axleDesigns.vehicleId, vehicle.id));
    const design = (axle: AxleName, name: string) => {
      const d = designs.find((x) => x.axle === axle && x.name === name);
      if (!d) throw new Error(`seed: ${axle} design ${name} missing`);
      return d.id;
    };
    const created = await service.create(teamId, userId.get(c.author)!, {
      name: c.name,
      vehicleId: vehicle.id,
      frontDesignId: design('front', c.front),
      rearDesignId: design('rear', c.rear),
      trackProfile: c.trackProfile,
      message: c.message,
    });
    for (const step of c.steps) {
      const critical = step.acknowledge ? (await new ReviewGates(tx, service, inProcessPool, 60_000).status(teamId, created)).critical : [];
      const gate = { acknowledgements: critical.map((c) => ({ axle: c.axle, code: c.code, reason: step.acknowledge! })) };
      await service.transition(teamId, created.id, { id: userId.get(step.by)!, roles: roles.get(step.by)! }, step.action, { message: step.message, gate });
    }
    for (const comment of c.comments ?? []) {
      await service.addComment(teamId, created, userId.get(comment.by)!, { body: comment.body, resultRef: comment.resultRef });
    }
  }
}
