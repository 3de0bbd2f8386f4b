/**
 * Idempotent seed of the invented demo scenario (docs: team-rules "Demo
 * scenario"): creates whatever is missing and leaves existing rows alone, so
 * it can run at every start without undoing what demo users changed.
 * Never run in production.
 */
import bcrypt from 'bcryptjs';
import { and, eq, inArray } from 'drizzle-orm';
import type { Orm } from './client.js';
import { axleDesignRevisions, axleDesigns, memberships, teams, users, vehicleRevisions, vehicles, type Axle } from './schema.js';
import type { Role } from '../permissions.js';
import { exampleVehicles, type ExampleVehicleName } from '../../shared/balance/examples.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import type { Corner } from '../../shared/schema/corner.js';

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
  axle: Axle;
  name: string;
  corner: Corner;
}

interface DemoTeam {
  slug: string;
  name: string;
  members: { email: string; roles: Role[] }[];
  vehicles: { example: ExampleVehicleName; designs: DemoDesign[] }[];
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
  },
];

export async function seedDemo(orm: Orm, o: { bcryptRounds?: number } = {}): Promise<void> {
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
    const userRows = await tx.select({ id: users.id, email: users.email }).from(users).where(inArray(users.email, emails));
    const userId = new Map(userRows.map((u) => [u.email, u.id]));
    const ownerOf = (t: DemoTeam) => userId.get(t.members[0]!.email)!;

    for (const t of DEMO_TEAMS) {
      await tx.insert(teams).values({ slug: t.slug, name: t.name }).onConflictDoNothing();
      const [team] = await tx.select({ id: teams.id }).from(teams).where(eq(teams.slug, t.slug));
      if (!team) throw new Error(`seed: team ${t.slug} missing`);
      await tx
        .insert(memberships)
        .values(t.members.map((m) => ({ teamId: team.id, userId: userId.get(m.email)!, roles: m.roles })))
        .onConflictDoNothing();

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
    }
  });
}
