/** Shared set-up for API tests: a migrated fresh database, an app on it, and signed-in agents. */
import request from 'supertest';
import { expect } from 'vitest';
import { migratedDatabaseUrl, seededDatabaseUrl } from '../support/db.js';
import { loadConfig, type Config } from '../../server/config.js';
import { createDatabase, type Database } from '../../server/db/client.js';
import { migrateDatabase } from '../../server/db/migrate.js';
import { createApp, type RollwiseApp } from '../../server/app.js';
import { seedDemo, DEMO_PASSWORD } from '../../server/db/seed.js';

export { DEMO_PASSWORD };

export interface TestApp {
  app: RollwiseApp;
  db: Database;
  databaseUrl: string;
  config: Config;
  close(): Promise<void>;
}

export function testConfig(databaseUrl: string, overrides: Partial<Config> = {}): Config {
  // The 10 s compute limit guards a server against costly requests; a test that is not about it must not fail because a
  // loaded CI machine computes slowly (a demo snapshot's recompute took over 10 s at load 18). Tests of the limit set their own.
  return { ...loadConfig({ NODE_ENV: 'test' }), databaseUrl, staticDir: '/nonexistent-rollwise-static', computeTimeLimitMs: 60_000, ...overrides };
}

/**
 * A fresh database and an app on it: a copy of the run's migrated template, or with `seed` of
 * its seeded one (test/support/pg-global-setup.ts). `migrateDatabase` and, with `seed`,
 * `seedDemo` still run, as at every server start: on the copy they find nothing to do, and on a
 * `databaseUrl` you pass (say an empty `freshDatabaseUrl()`) they do it all.
 */
export async function startTestApp(o: { seed?: boolean; databaseUrl?: string; config?: Partial<Config> } = {}): Promise<TestApp> {
  const databaseUrl = o.databaseUrl ?? (o.seed ? seededDatabaseUrl() : migratedDatabaseUrl());
  const db = createDatabase(databaseUrl);
  await migrateDatabase(db);
  if (o.seed) await seedDemo(db.orm, { bcryptRounds: 4 });
  const config = testConfig(databaseUrl, o.config);
  const app = createApp(config, db);
  return {
    app,
    db,
    databaseUrl,
    config,
    async close() {
      await app.close();
      await db.close();
    },
  };
}

export type Agent = ReturnType<typeof request.agent>;

/** An agent that keeps cookies and sends the CSRF header on every request. */
export function agent(app: RollwiseApp): Agent {
  return request.agent(app).set('X-Rollwise-Request', '1');
}

export async function signIn(app: RollwiseApp, email: string, password = DEMO_PASSWORD): Promise<Agent> {
  const a = agent(app);
  const r = await a.post('/api/auth/sign-in').send({ email, password });
  expect(r.status, `sign-in of ${email}: ${JSON.stringify(r.body)}`).toBe(200);
  return a;
}

/**
 * The id of a demo record, found by what a person sees (a team's slug, a vehicle's, design's or configuration's
 * name) in a list the API gives `who` at `url`; fails naming the ones there are. `/api/teams` is found by slug,
 * everything else by name.
 */
export async function idOf(who: Agent, url: string, key: string): Promise<string> {
  const r = await who.get(url);
  expect(r.status, `GET ${url}: ${JSON.stringify(r.body)}`).toBe(200);
  const field = url === '/api/teams' ? 'slug' : 'name';
  const list = r.body as Record<string, string>[];
  const found = list.find((x) => x[field] === key);
  if (!found) throw new Error(`no ${field} "${key}" at ${url} among ${list.map((x) => x[field]).join(', ')}`);
  return found['id']!;
}

let counter = 0;
export async function registerUser(app: RollwiseApp, name = 'Test User'): Promise<{ agent: Agent; email: string; id: string }> {
  const email = `user${++counter}-${Date.now()}@test.example`;
  const a = agent(app);
  const r = await a.post('/api/auth/register').send({ email, password: 'long-enough-pass', displayName: name });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return { agent: a, email, id: r.body.user.id as string };
}

/** The token of the newest link of `kind` mailed to `email` (read from the outbox: the mail as the app wrote it). */
export async function mailedLink(t: TestApp, email: string, kind: 'invitation' | 'verify-email' | 'password-reset'): Promise<string> {
  const r = await t.db.pool.query<{ text_body: string }>(
    'SELECT text_body FROM mail_outbox WHERE kind = $1 AND to_address = $2 ORDER BY created_at DESC LIMIT 1',
    [kind, email.toLowerCase()],
  );
  const path = { invitation: 'invitations', 'verify-email': 'verify-email', 'password-reset': 'reset-password' }[kind];
  const m = new RegExp(`/${path}/([A-Za-z0-9._~-]+)`).exec(r.rows[0]?.text_body ?? '');
  if (!m) throw new Error(`no ${kind} mail to ${email}`);
  return m[1]!;
}

/** Confirms the signed-in person's address with the link mailed at registration (a no-op when it is confirmed). */
export async function verifyAddress(t: TestApp, who: Agent, email: string): Promise<void> {
  const me = await who.get('/api/auth/me');
  expect(me.status, JSON.stringify(me.body)).toBe(200);
  if (me.body.user.emailVerified) return;
  const r = await who.post('/api/auth/verify-email').send({ token: await mailedLink(t, email, 'verify-email') });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
}

/**
 * Adds a person to a team the only way there is: the owner invites the address, and the
 * person, signed in with that address (confirmed first), accepts the mailed link.
 */
export async function addMember(t: TestApp, owner: Agent, teamId: string, member: { agent: Agent; email: string }, roles: string[]): Promise<void> {
  const inv = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: member.email, roles });
  expect(inv.status, JSON.stringify(inv.body)).toBe(201);
  await verifyAddress(t, member.agent, member.email);
  const r = await member.agent.post(`/api/invitations/${await mailedLink(t, member.email, 'invitation')}/accept`).send({});
  expect(r.status, JSON.stringify(r.body)).toBe(200);
}

/** The `{ error: { code, message } }` shape, with the given status and code. */
export function expectError(r: request.Response, status: number, code: string): void {
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  expect(r.body?.error?.code).toBe(code);
  expect(typeof r.body.error.message).toBe('string');
  expect(JSON.stringify(r.body)).not.toMatch(/\bat \S+ \(|node_modules|\.ts:\d+/);
}

/** One mounted route, as `METHOD /full/path/:param` (Express 5 / router 2 layers). */
export interface MountedRoute {
  method: string;
  path: string;
}

/**
 * Every route the app has mounted, read from its router stack: nested routers
 * are walked with their mount paths (`:teamId` and other params kept as
 * written), so a new route shows up here without anyone listing it.
 */
export function listRoutes(app: RollwiseApp): MountedRoute[] {
  interface Layer {
    route?: { path: string | string[]; methods: Record<string, boolean> };
    handle?: { stack?: Layer[] };
    rawPath?: string | string[];
    slash?: boolean;
  }
  const out: MountedRoute[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const l of stack) {
      if (l.route) {
        for (const p of ([] as string[]).concat(l.route.path)) {
          for (const [m, on] of Object.entries(l.route.methods)) if (on && m !== '_all') out.push({ method: m.toUpperCase(), path: `${prefix}${p === '/' ? '' : p}` });
        }
      } else if (l.handle?.stack) {
        if (Array.isArray(l.rawPath)) throw new Error('listRoutes: a router mounted at several paths');
        walk(l.handle.stack, prefix + (l.slash || l.rawPath === undefined ? '' : l.rawPath));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  if (out.length === 0) throw new Error('listRoutes: no routes found (has the router layout changed?)');
  return out;
}

/**
 * A TCP relay in front of PostgreSQL: `stop()` ends every connection through
 * it with PostgreSQL's own shutdown message (pg_terminate_backend: FATAL
 * 57P01, what a stopping server sends) and closes the port, as a stopped
 * server does; `start()` opens it again. Stops "the database" for one app
 * without stopping the cluster other test files share.
 */
export class DatabaseRelay {
  private server: import('node:net').Server | undefined;
  private readonly sockets = new Set<import('node:net').Socket>();
  readonly url: string;
  constructor(
    private readonly directUrl: string,
    readonly port: number,
  ) {
    const u = new URL(directUrl);
    u.port = String(port);
    this.url = u.toString();
  }
  async start(): Promise<void> {
    const net = await import('node:net');
    const target = Number(new URL(this.directUrl).port);
    this.server = net.createServer((client) => {
      const upstream = net.connect(target, '127.0.0.1');
      const pair = [client, upstream];
      for (const s of pair) {
        this.sockets.add(s);
        s.on('error', () => s.destroy());
        // When one side goes, the other follows (as one TCP connection would): a side destroyed after an error
        // does not end its pipe, and a pg client left on a half-open relay waits for ever in pool.end().
        s.on('close', () => {
          this.sockets.delete(s);
          for (const other of pair) {
            if (other === s || other.destroyed) continue;
            other.end();
            setTimeout(() => other.destroy(), 100).unref();
          }
        });
      }
      client.pipe(upstream).pipe(client);
    });
    await new Promise<void>((resolve) => this.server!.listen(this.port, '127.0.0.1', resolve));
  }
  /** Drops every connection abruptly (no goodbye from the server, as when the network fails) and closes the port. */
  async cut(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    const closed = new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
    for (const s of this.sockets) s.destroy();
    await closed;
  }
  /** Terminates the backends of connections made through the relay, then closes it. */
  async stop(): Promise<void> {
    const pg = (await import('pg')).default;
    const admin = new pg.Client({ connectionString: this.directUrl });
    await admin.connect();
    try {
      // Connections through the relay arrive from 127.0.0.1 on the relay's outgoing ports: every backend of this database but ours.
      await admin.query('SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()');
    } finally {
      await admin.end();
    }
    await this.cut();
  }
}
