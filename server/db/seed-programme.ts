/**
 * Demo programme of the invented scenario: the demo instructor (Iris Calder)
 * runs a programme comparing the two demo teams; Tallowmere has accepted,
 * Brackenfield's owner has yet to answer (so the demo shows both sides).
 * Idempotent like seedDemo: creates only what is missing and never undoes a
 * demo user's answer. Runs after seedDemo (it needs the demo users and
 * teams) and goes through the programme service, as the API does.
 * Never run in production.
 */
import { eq, sql } from 'drizzle-orm';
import type { Orm } from './client.js';
import { memberships, teams, users } from './schema.js';
import { createComputePool } from '../compute/pool.js';
import { Configurations } from '../services/configurations.js';
import { Programmes } from '../services/programmes.js';
import type { TrackProfileId } from '../../shared/tracks/profiles.js';

export const DEMO_PROGRAMME = {
  name: 'Winter roll-steer comparison',
  trackProfile: 'bumpy-circuit' as TrackProfileId,
  instructorEmail: 'instructor@programme.example',
  /** Team address → whether the demo has its owner accept. */
  teams: [
    { slug: 'tallowmere', accept: true },
    { slug: 'brackenfield', accept: false },
  ],
} as const;

export async function seedDemoProgramme(orm: Orm): Promise<void> {
  // The service needs the configurations service only for the board; its
  // compute pool starts no thread until something is computed (nothing is here).
  const pool = createComputePool({ threads: 1 });
  const programmes = new Programmes(orm, new Configurations(orm, pool, 10_000, 'http://127.0.0.1'));
  try {
    // One advisory lock (held by this transaction while the service works on
    // other connections): two servers starting together seed once.
    await orm.transaction(async (tx) => {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(742002)`);
      const [instructor] = await orm
        .select({ id: users.id, instructor: users.instructor })
        .from(users)
        .where(eq(users.email, DEMO_PROGRAMME.instructorEmail));
      if (!instructor?.instructor) throw new Error('seedDemoProgramme: the demo instructor is missing; run seedDemo first');

      let programme = (await programmes.list(instructor)).find((p) => p.name === DEMO_PROGRAMME.name);
      programme ??= await programmes.create(instructor, { name: DEMO_PROGRAMME.name, trackProfile: DEMO_PROGRAMME.trackProfile });

      for (const t of DEMO_PROGRAMME.teams) {
        const [team] = await orm.select({ id: teams.id }).from(teams).where(eq(teams.slug, t.slug));
        if (!team) throw new Error(`seedDemoProgramme: demo team ${t.slug} is missing; run seedDemo first`);
        const loaded = await programmes.load(instructor, programme.id);
        const entry = (await programmes.get(loaded)).teams.find((x) => x.teamId === team.id);
        if (!entry) await programmes.inviteTeam(loaded, t.slug);
        // Accept only a fresh invitation: an answer a demo user gave stays.
        if (t.accept && (!entry || entry.status === 'invited')) {
          const owners = await orm
            .select({ userId: memberships.userId })
            .from(memberships)
            .where(sql`${memberships.teamId} = ${team.id} AND 'owner' = ANY(${memberships.roles})`)
            .limit(1);
          if (!owners[0]) throw new Error(`seedDemoProgramme: demo team ${t.slug} has no owner`);
          await programmes.decide(team.id, programme.id, owners[0].userId, 'accepted');
        }
      }
    });
  } finally {
    await pool.close();
  }
}
