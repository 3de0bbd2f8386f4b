/**
 * Activity log paging (`before` + `beforeId`): entries written by one
 * transaction share one time (PostgreSQL's now() is the transaction's start),
 * and times carry microseconds while the API sends milliseconds; paging must
 * still return every entry once, newest first.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { registerUser, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let owner: Agent;
let teamId = '';

beforeAll(async () => {
  t = await startTestApp();
  owner = (await registerUser(t.app, 'Paging Owner')).agent;
  teamId = (await owner.post('/api/teams').send({ name: 'Paging Test Team', slug: `paging-${Date.now()}` }).expect(201)).body.id;
  // Seven entries in one transaction (one shared time), then three a few microseconds apart within one millisecond.
  await t.db.pool.query(
    `INSERT INTO activity_log (team_id, action, subject_type, summary)
     SELECT $1, 'member.add', 'member', 'bulk ' || n FROM generate_series(1, 7) AS n`,
    [teamId],
  );
  await t.db.pool.query(
    `INSERT INTO activity_log (team_id, action, subject_type, summary, at)
     SELECT $1, 'member.roles', 'member', 'micro ' || n, date_trunc('milliseconds', now()) + interval '1 second' + n * interval '1 microsecond'
     FROM generate_series(1, 3) AS n`,
    [teamId],
  );
});
afterAll(async () => {
  await t?.close();
});

interface Entry {
  id: string;
  at: string;
  summary: string;
}

async function pageThrough(limit: number): Promise<Entry[]> {
  const seen: Entry[] = [];
  let cursor: Record<string, string> = {};
  for (let i = 0; i < 50; i++) {
    const r = await owner.get(`/api/teams/${teamId}/activity`).query({ limit, ...cursor }).expect(200);
    const page = r.body as Entry[];
    seen.push(...page);
    if (page.length < limit) return seen;
    const last = page[page.length - 1]!;
    cursor = { before: last.at, beforeId: last.id };
  }
  throw new Error('paging did not end');
}

describe('activity paging', () => {
  it('returns every entry exactly once, however the pages fall', async () => {
    const all = (await owner.get(`/api/teams/${teamId}/activity`).query({ limit: 5000 }).expect(200)).body as Entry[];
    const total = Number((await t.db.pool.query('SELECT count(*)::int AS n FROM activity_log WHERE team_id = $1', [teamId])).rows[0].n);
    expect(all).toHaveLength(total);
    expect(total).toBeGreaterThanOrEqual(10);
    for (const limit of [1, 2, 3, 4]) {
      const paged = await pageThrough(limit);
      expect(paged.map((e) => e.id), `limit ${limit}`).toEqual(all.map((e) => e.id));
    }
    // Newest first: the microsecond entries (a second later) lead.
    expect(all.slice(0, 3).map((e) => e.summary).sort()).toEqual(['micro 1', 'micro 2', 'micro 3']);
  });

  it('keeps the old meaning of `before` alone: strictly older than that time', async () => {
    const all = (await owner.get(`/api/teams/${teamId}/activity`).query({ limit: 5000 }).expect(200)).body as Entry[];
    const older = (await owner.get(`/api/teams/${teamId}/activity`).query({ before: all[0]!.at }).expect(200)).body as Entry[];
    expect(older.every((e) => e.at < all[0]!.at)).toBe(true);
    expect(older.map((e) => e.summary)).not.toContain('micro 1');
  });

  it('refuses a malformed beforeId and one without before', async () => {
    await owner.get(`/api/teams/${teamId}/activity`).query({ before: new Date().toISOString(), beforeId: 'nope' }).expect(400);
    await owner.get(`/api/teams/${teamId}/activity`).query({ beforeId: '00000000-0000-4000-8000-000000000000' }).expect(400);
  });
});
