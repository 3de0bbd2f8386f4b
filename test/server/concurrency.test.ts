/**
 * Nothing lost: two people saving the same axle design or vehicle at once,
 * an approval racing an edit, and the server killed in the middle of a burst
 * of saves. The single-session basics (a stale save is 409, four racing
 * saves from one session) are in vehicles.test.ts.
 *
 * How both versions survive: the server stores only the winner; the loser's
 * 409 `stale_revision` carries the current revision in full
 * (`details.current`), so the editor shows both side by side (issue 6) and the
 * loser saves theirs on top of it. These tests do what the editor does and
 * check that both end up in the history with their authors.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import pg from 'pg';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { freshDatabaseUrl } from '../support/db.js';
import { addMember, DEMO_PASSWORD, expectError, idOf, registerUser, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let dana: Agent; // designer
let eli: Agent; // engineer
let sam: Agent; // a second designer + engineer, added for these tests
let owner: Agent;
let reviewer: Agent;
let teamId = '';
let vehicleId = '';
let frontId = '';
let rearId = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  [dana, eli, owner, reviewer] = await Promise.all([
    signIn(t.app, 'designer@tallowmere.example'),
    signIn(t.app, 'engineer@tallowmere.example'),
    signIn(t.app, 'owner@tallowmere.example'),
    signIn(t.app, 'reviewer@tallowmere.example'),
  ]);
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
  const s = await registerUser(t.app, 'Sam Second');
  await addMember(t, owner, teamId, s, ['engineer', 'designer']);
  sam = s.agent;
  vehicleId = await idOf(owner, `/api/teams/${teamId}/vehicles`, 'TUR-26 Ember');
  const designs = (await owner.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  frontId = designs.find((d) => d.name === 'Front baseline')!.id;
  rearId = designs.find((d) => d.name === 'Rear baseline')!.id;
});
afterAll(async () => {
  await t?.close();
});

type Corner = typeof exampleCorners.fsFrontWishbone;
/** The front corner with the inner tie-rod point raised by `dzMm`. */
function raised(dzMm: number): Corner {
  const c = structuredClone(exampleCorners.fsFrontWishbone);
  const p = c.points.tieRodInner;
  c.points.tieRodInner = [p[0], p[1], p[2] + dzMm];
  return c;
}
const tieRodZ = (corner: { points: { tieRodInner: readonly [number, number, number] } }) => corner.points.tieRodInner[2];

describe('two sessions save the same axle design at once', () => {
  it('exactly one wins each round; the other gets 409 with the current revision, saves on top, and both are in the history', async () => {
    const design = (await dana.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'front', name: 'Contested front', corner: exampleCorners.fsFrontWishbone }).expect(201)).body;
    const url = `/api/teams/${teamId}/axle-designs/${design.id}`;
    const authored: { revision: number; author: string; z: number }[] = [];
    for (let round = 1; round <= 3; round++) {
      const base = (await dana.get(url).expect(200)).body.revision as number;
      // Dana and Sam each send two saves from the same base, all at once.
      const attempts = [
        { who: dana, name: 'Dana Quist', dz: round },
        { who: sam, name: 'Sam Second', dz: -round },
        { who: dana, name: 'Dana Quist', dz: round + 0.5 },
        { who: sam, name: 'Sam Second', dz: -round - 0.5 },
      ];
      const answers = await Promise.all(attempts.map((a) => a.who.put(`${url}/corner`).send({ corner: raised(a.dz), baseRevision: base, message: `${a.name} round ${round}` })));
      expect(answers.map((r) => r.status).sort()).toEqual([200, 409, 409, 409]);
      const winner = answers.findIndex((r) => r.status === 200);
      const winnerZ = tieRodZ(raised(attempts[winner]!.dz));
      expect(answers[winner]!.body.revision).toBe(base + 1);
      authored.push({ revision: base + 1, author: attempts[winner]!.name, z: winnerZ });
      // Every loser learns the current revision in full: what the editor shows beside its own input.
      for (const [i, r] of answers.entries()) {
        if (i === winner) continue;
        expectError(r, 409, 'stale_revision');
        expect(r.body.error.details.current.revision).toBe(base + 1);
        expect(tieRodZ(r.body.error.details.current.corner)).toBeCloseTo(winnerZ, 9);
      }
      // The first loser keeps theirs: saved on top of the winner's revision.
      const loser = answers.findIndex((r) => r.status === 409);
      const mine = attempts[loser]!;
      const onTop = await mine.who.put(`${url}/corner`).send({ corner: raised(mine.dz), baseRevision: answers[loser]!.body.error.details.current.revision, message: `${mine.name} kept` });
      expect(onTop.status, JSON.stringify(onTop.body)).toBe(200);
      expect(onTop.body.revision).toBe(base + 2);
      authored.push({ revision: base + 2, author: mine.name, z: tieRodZ(raised(mine.dz)) });
    }
    const revisions = (await dana.get(`${url}/revisions`).expect(200)).body as { revision: number; authorName: string }[];
    expect(revisions.map((r) => r.revision)).toEqual([7, 6, 5, 4, 3, 2, 1]);
    for (const a of authored) {
      const r = (await dana.get(`${url}/revisions/${a.revision}`).expect(200)).body;
      expect(tieRodZ(r.corner), `revision ${a.revision}`).toBeCloseTo(a.z, 9);
      expect(revisions.find((x) => x.revision === a.revision)!.authorName).toBe(a.author);
    }
  });
});

describe('two sessions change the same vehicle at once', () => {
  it('a rename and a data edit from the same base: one wins, the other is 409 and goes on top', async () => {
    const v = (await eli.post(`/api/teams/${teamId}/vehicles`).send({ name: 'Contested car', data: exampleVehicles.tur26Ember }).expect(201)).body;
    const url = `/api/teams/${teamId}/vehicles/${v.id}`;
    const heavier = { ...exampleVehicles.tur26Ember, massKg: exampleVehicles.tur26Ember.massKg + 7 };
    const [rename, data] = await Promise.all([
      owner.patch(url).send({ name: 'Contested car (renamed)', baseRevision: 1 }),
      sam.put(`${url}/data`).send({ data: heavier, baseRevision: 1, message: 'ballast' }),
    ]);
    expect([rename.status, data.status].sort()).toEqual([200, 409]);
    const lost = rename.status === 409 ? rename : data;
    expectError(lost, 409, 'stale_revision');
    expect(lost.body.error.details.current.revision).toBe(2);
    // The loser re-applies their change on top.
    const retry =
      lost === rename
        ? await owner.patch(url).send({ name: 'Contested car (renamed)', baseRevision: 2 })
        : await sam.put(`${url}/data`).send({ data: heavier, baseRevision: 2, message: 'ballast' });
    expect(retry.status, JSON.stringify(retry.body)).toBe(200);
    const now = (await eli.get(url).expect(200)).body;
    expect(now).toMatchObject({ revision: 3, name: 'Contested car (renamed)' });
    expect(now.data.massKg).toBe(heavier.massKg);
    const revs = (await eli.get(`${url}/revisions`).expect(200)).body as { revision: number }[];
    expect(revs.map((r) => r.revision)).toEqual([3, 2, 1]);
  });
});

describe('accepting a proposal racing a hardpoint edit', () => {
  it('one of them lands; the other is refused whole: a proposal is accepted with its revision or stays open', async () => {
    const design = (await dana.post(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'front', name: 'Proposal race', corner: exampleCorners.fsFrontWishbone }).expect(201)).body;
    const url = `/api/teams/${teamId}/axle-designs/${design.id}`;
    for (const delayMs of [0, 0, 5, 15, 30]) {
      const base = (await dana.get(url).expect(200)).body.revision as number;
      const proposal = (await eli.post(`${url}/proposals`).send({ corner: raised(7), baseRevision: base, message: 'from the intent' }).expect(201)).body;
      const [accept, edit] = await Promise.all([
        dana.post(`${url}/proposals/${proposal.id}/accept`).send({}),
        new Promise((r) => setTimeout(r, delayMs)).then(() => sam.put(`${url}/corner`).send({ corner: raised(-7), baseRevision: base, message: 'by hand' })),
      ]);
      expect([accept.status, edit.status].sort(), `${JSON.stringify(accept.body)} ${JSON.stringify(edit.body)}`).toEqual([200, 409]);
      const now = (await dana.get(url).expect(200)).body;
      expect(now.revision).toBe(base + 1);
      const p = (await dana.get(`${url}/proposals/${proposal.id}`).expect(200)).body;
      if (accept.status === 200) {
        expect(p).toMatchObject({ status: 'accepted', acceptedRevision: base + 1 });
        expect(tieRodZ(now.corner)).toBeCloseTo(tieRodZ(raised(7)), 9);
        expectError(edit, 409, 'stale_revision');
      } else {
        // Refused whole: still open, nothing of it in the design; the edit is the new revision.
        expect(p).toMatchObject({ status: 'open', acceptedRevision: null });
        expect(tieRodZ(now.corner)).toBeCloseTo(tieRodZ(raised(-7)), 9);
        expect(accept.body.error.details.current.revision).toBe(base + 1);
      }
    }
  });
});

describe('an approval racing an edit', () => {
  /** A configuration by the engineer, submitted for review. */
  async function inReview(name: string): Promise<{ url: string; revision: number }> {
    const c = await eli.post(`/api/teams/${teamId}/configurations`).send({ name, vehicleId, frontDesignId: frontId, rearDesignId: rearId, trackProfile: 'smooth-circuit' });
    expect(c.status, JSON.stringify(c.body)).toBe(201);
    const url = `/api/teams/${teamId}/configurations/${c.body.id}`;
    await eli.post(`${url}/submit`).send({}).expect(200);
    return { url, revision: c.body.revision };
  }

  it('whichever lands first, the approval is of the revision it saw, the edit makes a draft, and the status history is one unbroken chain', async () => {
    const outcomes = new Set<string>();
    // The approval computes results before it writes; the edit starts a little later each round so both orders happen.
    // (The sign-off gate now measures both axles' cautions first, so the longest delay is 2 s.)
    for (const delayMs of [0, 40, 120, 250, 500, 1000, 2000]) {
      const c = await inReview(`Race ${delayMs}`);
      // A written reason for each Critical caution, gathered before the race (the gate itself: review-gates.test.ts).
      const critical = (await reviewer.get(`${c.url}/gates`).expect(200)).body.critical as { axle: string; code: string }[];
      const acknowledgements = critical.map((x) => ({ axle: x.axle, code: x.code, reason: 'accepted for the race test' }));
      const [approve, revise] = await Promise.all([
        reviewer.post(`${c.url}/approve`).send({ revision: c.revision, acknowledgements }),
        new Promise((r) => setTimeout(r, delayMs)).then(() => eli.put(c.url).send({ baseRevision: c.revision, trackProfile: 'bumpy-circuit', message: 'softer track' })),
      ]);
      expect([200, 409], JSON.stringify(approve.body)).toContain(approve.status);
      expect(revise.status, JSON.stringify(revise.body)).toBe(200);
      outcomes.add(approve.status === 200 ? 'approved first' : 'edited first');
      if (approve.status === 409) expect(approve.body.error.code).toBe('stale_revision');

      const now = (await owner.get(c.url).expect(200)).body;
      expect(now.revision).toBe(c.revision + 1);
      expect(now.status).toBe('draft');
      const approvals = (await owner.get(`${c.url}/approvals`).expect(200)).body as { id: string; revision: number }[];
      expect(approvals.map((a) => a.revision)).toEqual(approve.status === 200 ? [c.revision] : []);
      // The snapshot holds the references of the revision that was approved, not the edit's.
      if (approvals.length) {
        const snap = (await owner.get(`${c.url}/approvals/${approvals[0]!.id}`).expect(200)).body;
        expect(snap.revision).toBe(c.revision);
        expect(snap.inputs.trackProfile).toBe('smooth-circuit');
      }
      const chain = await t.db.pool.query<{ revision: number; from_status: string; to_status: string }>(
        'SELECT revision, from_status, to_status FROM configuration_transitions WHERE configuration_id = $1 ORDER BY revision, created_at, id',
        [now.id],
      );
      const steps = chain.rows.map((r) => `${r.revision}:${r.from_status}->${r.to_status}`);
      for (let i = 1; i < chain.rows.length; i++) {
        expect(chain.rows[i]!.from_status, `status history ${steps.join(', ')}`).toBe(chain.rows[i - 1]!.to_status);
      }
      expect(chain.rows.at(-1)!.to_status).toBe('draft');
    }
    // Both orders were exercised (otherwise the check above proved only one of them).
    expect([...outcomes].sort()).toEqual(['approved first', 'edited first']);
  });
});

describe('the server killed in the middle of a burst of saves', () => {
  const databaseUrl = () => killDb;
  let killDb = '';
  let child: ChildProcess | undefined;

  /** `node --import tsx server/main.ts` on the given database; resolves with its URL once it listens. */
  async function spawnServer(): Promise<{ proc: ChildProcess; url: string }> {
    const proc = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
      cwd: process.cwd(),
      env: { ...process.env, NODE_ENV: 'test', DATABASE_URL: databaseUrl(), PORT: '0', HOST: '127.0.0.1', ROLLWISE_SEED_DEMO: '1', BCRYPT_ROUNDS: '4', LOG_LEVEL: 'silent', COMPUTE_THREADS: '1' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    proc.stderr.on('data', (d) => (err += String(d)));
    const url = await new Promise<string>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`server did not start: ${out} ${err}`)), 30_000);
      proc.stdout.on('data', (d) => {
        out += String(d);
        const m = /Rollwise is running at (\S+)/.exec(out);
        if (m) {
          clearTimeout(timer);
          resolve(m[1]!);
        }
      });
      proc.once('exit', (code) => {
        clearTimeout(timer);
        reject(new Error(`server exited with ${code}: ${out} ${err}`));
      });
    });
    return { proc, url };
  }

  async function signInAt(url: string, email: string): Promise<(path: string, init?: { method?: string; body?: unknown }) => Promise<Response>> {
    const r = await fetch(`${url}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json', 'x-rollwise-request': '1' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
    expect(r.status).toBe(200);
    const cookie = r.headers.get('set-cookie')!.split(';')[0]!;
    return (path, init = {}) =>
      fetch(`${url}${path}`, {
        method: init.method ?? 'GET',
        headers: { cookie, 'x-rollwise-request': '1', ...(init.body === undefined ? {} : { 'content-type': 'application/json' }) },
        body: init.body === undefined ? null : JSON.stringify(init.body),
      });
  }

  /** Heads that match their latest revision row, revisions numbered 1..head, and one activity row per saved revision. */
  async function checkConsistent(db: pg.Pool) {
    const designs = await db.query(`
      SELECT d.id, d.revision AS head, max(r.revision) AS latest, count(r.*)::int AS n,
             bool_and(r.revision <> d.revision OR (r.corner = d.corner AND r.name = d.name)) AS head_matches
      FROM axle_designs d LEFT JOIN axle_design_revisions r ON r.design_id = d.id GROUP BY d.id`);
    for (const d of designs.rows) {
      expect(d, 'axle design head vs revisions').toMatchObject({ latest: d.head, n: d.head, head_matches: true });
    }
    const vehicles = await db.query(`
      SELECT v.id, v.revision AS head, max(r.revision) AS latest, count(r.*)::int AS n,
             bool_and(r.revision <> v.revision OR (r.data = v.data AND r.name = v.name)) AS head_matches
      FROM vehicles v LEFT JOIN vehicle_revisions r ON r.vehicle_id = v.id GROUP BY v.id`);
    for (const v of vehicles.rows) expect(v, 'vehicle head vs revisions').toMatchObject({ latest: v.head, n: v.head, head_matches: true });
    const activity = await db.query(`
      SELECT d.id, d.revision, (SELECT count(*)::int FROM activity_log a WHERE a.subject_id = d.id AND a.action = 'design.corner') AS saves
      FROM axle_designs d`);
    return { designs: designs.rows.length, activity: new Map(activity.rows.map((r) => [r.id as string, { revision: r.revision as number, saves: r.saves as number }])) };
  }

  beforeAll(() => {
    killDb = freshDatabaseUrl('kill');
  });
  afterAll(() => {
    child?.kill('SIGKILL');
  });

  it('SIGKILL mid-burst leaves every revision whole and every head on its latest revision; the next start is clean', async () => {
    const first = await spawnServer();
    child = first.proc;
    const designer = await signInAt(first.url, 'designer@tallowmere.example');
    const engineer = await signInAt(first.url, 'engineer@tallowmere.example');
    const teams = (await (await designer('/api/teams')).json()) as { id: string; slug: string }[];
    const team = teams.find((x) => x.slug === 'tallowmere')!.id;
    const vehicles = (await (await designer(`/api/teams/${team}/vehicles`)).json()) as { id: string }[];
    const designIds: string[] = [];
    for (const v of vehicles) designIds.push(...((await (await designer(`/api/teams/${team}/vehicles/${v.id}/axle-designs`)).json()) as { id: string }[]).map((d) => d.id));
    const db = new pg.Pool({ connectionString: databaseUrl(), max: 2 });
    try {
      const before = await checkConsistent(db);

      // Chains of saves, each on top of the previous answer, on every design and vehicle at once.
      let saved = 0;
      let stopped = false;
      const chain = async (load: () => Promise<Response>, save: (rev: number, i: number) => Promise<Response>) => {
        let rev = ((await (await load()).json()) as { revision: number }).revision;
        for (let i = 0; !stopped; i++) {
          try {
            const r = await save(rev, i);
            if (r.status !== 200) throw new Error(`save answered ${r.status}: ${await r.text()}`);
            rev = ((await r.json()) as { revision: number }).revision;
            saved++;
          } catch (e) {
            if (stopped) return;
            throw e;
          }
        }
      };
      const burst = [
        ...designIds.map((id) =>
          chain(
            () => designer(`/api/teams/${team}/axle-designs/${id}`),
            async (rev, i) => {
              const cur = (await (await designer(`/api/teams/${team}/axle-designs/${id}`)).json()) as { corner: Corner };
              const c = structuredClone(cur.corner);
              c.points.tieRodInner = [c.points.tieRodInner[0], c.points.tieRodInner[1], c.points.tieRodInner[2] + (i % 2 ? -0.25 : 0.25)];
              return designer(`/api/teams/${team}/axle-designs/${id}/corner`, { method: 'PUT', body: { corner: c, baseRevision: rev, message: `burst ${i}` } });
            },
          ),
        ),
        ...vehicles.map((v) =>
          chain(
            () => engineer(`/api/teams/${team}/vehicles/${v.id}`),
            async (rev, i) => {
              const cur = (await (await engineer(`/api/teams/${team}/vehicles/${v.id}`)).json()) as { data: { massKg: number } };
              return engineer(`/api/teams/${team}/vehicles/${v.id}/data`, { method: 'PUT', body: { data: { ...cur.data, massKg: cur.data.massKg + (i % 2 ? -1 : 1) }, baseRevision: rev } });
            },
          ),
        ),
      ];
      // Kill once saves are flowing, without waiting for any of them.
      while (saved < 12) await new Promise((r) => setTimeout(r, 5));
      stopped = true;
      first.proc.kill('SIGKILL');
      await once(first.proc, 'exit');
      await Promise.allSettled(burst);
      expect(saved).toBeGreaterThanOrEqual(12);

      const after = await checkConsistent(db);
      expect(after.designs).toBe(before.designs);
      let newRevisions = 0;
      for (const [id, a] of after.activity) {
        const b = before.activity.get(id)!;
        // Every committed save has its revision row and its activity row (one transaction), none half-written.
        expect(a.saves - b.saves, `design ${id}`).toBe(a.revision - b.revision);
        newRevisions += a.revision - b.revision;
      }
      expect(newRevisions).toBeGreaterThan(0);
      // No transaction left open or waiting by the killed server.
      const open = await db.query("SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid() AND state LIKE 'idle in transaction%'");
      expect(open.rows[0].n).toBe(0);

      // The next start migrates nothing new, seeds idempotently, and a save goes on top of the head.
      const second = await spawnServer();
      child = second.proc;
      expect((await fetch(`${second.url}/api/health`)).status).toBe(200);
      const d2 = await signInAt(second.url, 'designer@tallowmere.example');
      const id = designIds[0]!;
      const head = (await (await d2(`/api/teams/${team}/axle-designs/${id}`)).json()) as { revision: number; corner: Corner };
      expect(head.revision).toBe(after.activity.get(id)!.revision);
      const next = await d2(`/api/teams/${team}/axle-designs/${id}/corner`, { method: 'PUT', body: { corner: head.corner, baseRevision: head.revision, message: 'after restart' } });
      expect(next.status).toBe(200);
      expect(((await next.json()) as { revision: number }).revision).toBe(head.revision + 1);
      await checkConsistent(db);
      second.proc.kill('SIGTERM');
      const [code] = await once(second.proc, 'exit');
      expect(code).toBe(0);
      child = undefined;
    } finally {
      await db.end();
    }
  }, 60_000);
});
