/**
 * Anonymous clients cannot burn the server's time (issue 12 §4): what will
 * be refused (wrong content type, no CSRF header, not signed in) is refused
 * before the body is parsed; each route reads only as much as it needs; the
 * nesting check runs on the raw bytes, before JSON.parse.
 *
 * "Parsed" is observed as work done, not as time: JSON.parse is watched, and
 * every body sent here carries a marker string, so a body that reached the
 * parser shows up as a call whose text holds the marker. No wall-clock bound
 * is asserted (the load run, `npm run load`, prints the health latency under
 * a 1 MB anonymous flood beside its idle latency).
 */
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { BODY_LIMITS, PUBLIC_BODY_ROUTES } from '../../server/http/body.js';
import { agent, expectError, idOf, listRoutes, signIn, startTestApp, type TestApp } from './helpers.js';

let t: TestApp;
let teamId = '';
let vehicleId = '';
beforeAll(async () => {
  t = await startTestApp({ seed: true });
  const owner = await signIn(t.app, 'owner@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
  vehicleId = (await owner.get(`/api/teams/${teamId}/vehicles`).expect(200)).body[0].id;
});
afterAll(async () => {
  await t?.close();
});

let marker = 0;
/** A unique string to find in JSON.parse's input. */
const newMarker = () => `door-probe-${++marker}-${Date.now()}`;

/** Watches JSON.parse; `sawMarker(m)` says whether any text holding `m` was parsed, `bytes` how much text was parsed. */
function watchParse() {
  const seen: string[] = [];
  const original = JSON.parse;
  const spy = vi.spyOn(JSON, 'parse').mockImplementation((text: string, reviver?: Parameters<typeof JSON.parse>[1]) => {
    seen.push(String(text));
    return original(text, reviver);
  });
  return {
    sawMarker: (m: string) => seen.some((s) => s.includes(m)),
    bytes: () => seen.reduce((n, s) => n + s.length, 0),
    restore: () => spy.mockRestore(),
  };
}
afterEach(() => vi.restoreAllMocks());

/** A body that is not JSON at all (it would be 400 malformed_json if parsed), carrying the marker. */
const broken = (m: string) => `{"name": "${m}", `;

describe('refused before the body is parsed', () => {
  it('anonymous: every route that needs a signed-in user answers 401 without parsing the body; the public ones read it', async () => {
    const OTHER = '7d1e6c1a-3b9f-4e7a-8c2d-5f0a1b2c3d4e';
    const routes = listRoutes(t.app)
      .filter((r) => r.path.startsWith('/api/') && !['GET', 'HEAD', 'OPTIONS'].includes(r.method))
      .map((r) => ({ ...r, url: r.path.replace(':teamId', teamId).replace(/:[A-Za-z]+/g, (p) => (p === ':token' ? 'some-invitation-link' : OTHER)) }));
    expect(routes.length).toBeGreaterThan(50);
    const watch = watchParse();
    const wrong: string[] = [];
    let publicRoutes = 0;
    for (const r of routes) {
      const m = newMarker();
      const method = r.method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete';
      const res = await request(t.app)[method](r.url).set('X-Rollwise-Request', '1').set('Content-Type', 'application/json').send(broken(m));
      const isPublic = PUBLIC_BODY_ROUTES.some((p) => p.test(r.path.slice('/api'.length).replace(/:[A-Za-z]+/g, 'x')));
      if (isPublic) {
        publicRoutes++;
        // A public route reads its body: the broken JSON is the answer.
        if (res.status !== 400 || res.body?.error?.code !== 'malformed_json') wrong.push(`${r.method} ${r.path} (public): ${res.status} ${JSON.stringify(res.body)}`);
      } else {
        if (res.status !== 401 || res.body?.error?.code !== 'unauthenticated') wrong.push(`${r.method} ${r.path}: ${res.status} ${JSON.stringify(res.body)}`);
        if (watch.sawMarker(m)) wrong.push(`${r.method} ${r.path}: the anonymous body was parsed`);
      }
    }
    watch.restore();
    expect(wrong).toEqual([]);
    // register, sign-in, sign-out, password-reset, its confirmation, verify-email, accepting an invitation.
    expect(publicRoutes).toBe(7);
  });

  it('no CSRF header → 403, a foreign content type → 415, an unknown token → 401: none of the bodies is parsed', async () => {
    const watch = watchParse();
    const m = newMarker();
    expectError(await request(t.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send(broken(m)), 403, 'csrf_refused');
    expectError(await request(t.app).put(`/api/teams/${teamId}/vehicles/${vehicleId}/data`).set('Content-Type', 'application/json').send(broken(m)), 403, 'csrf_refused');
    expectError(await request(t.app).post('/api/auth/sign-in').set('X-Rollwise-Request', '1').set('Content-Type', 'text/plain').send(broken(m)), 415, 'unsupported_media_type');
    expectError(await request(t.app).post('/api/compute/corner-sweep').set('Authorization', `Bearer rw_${'A'.repeat(43)}`).set('Content-Type', 'application/json').send(broken(m)), 401, 'invalid_token');
    expect(watch.sawMarker(m)).toBe(false);
    watch.restore();
  });

  it('signed in, the same broken body is read and answered 400 (the door lets members through)', async () => {
    const engineer = await signIn(t.app, 'engineer@tallowmere.example');
    const r = await engineer.put(`/api/teams/${teamId}/vehicles/${vehicleId}/data`).set('Content-Type', 'application/json').send(broken(newMarker()));
    expectError(r, 400, 'malformed_json');
  });

  it('a body nested too deep is refused from its raw bytes, before JSON.parse sees it', async () => {
    const engineer = await signIn(t.app, 'engineer@tallowmere.example');
    const watch = watchParse();
    const m = newMarker();
    const deep = `{"note":"${m}","x":${'['.repeat(65)}1${']'.repeat(65)}}`;
    const r = await engineer.post('/api/compute/corner-sweep').set('Content-Type', 'application/json').send(deep);
    expectError(r, 400, 'invalid_input');
    expect(watch.sawMarker(m)).toBe(false);
    watch.restore();
  });

  it('a flood of 1 MB anonymous bodies parses nothing, and health answers throughout', async () => {
    const megabyte = (m: string) => JSON.stringify({ name: m, data: Array.from({ length: 200_000 }, (_, i) => i % 10) });
    const watch = watchParse();
    const m = newMarker();
    const body = megabyte(m);
    expect(body.length).toBeGreaterThan(400_000);
    const targets = [`/api/teams/${teamId}/vehicles`, `/api/teams/${teamId}/vehicles/${vehicleId}/data`, '/api/compute/corner-sweep', `/api/teams/${teamId}/configurations`];
    const flood = Array.from({ length: 16 }, (_, i) =>
      request(t.app)
        [i % 2 ? 'put' : 'post'](i % 2 ? targets[1]! : targets[i % 4]!)
        .set('X-Rollwise-Request', '1')
        .set('Content-Type', 'application/json')
        .send(body),
    );
    const health = Array.from({ length: 8 }, () => request(t.app).get('/api/health'));
    const answers = await Promise.all([...flood, ...health]);
    for (const r of answers.slice(0, flood.length)) expectError(r, 401, 'unauthenticated');
    for (const r of answers.slice(flood.length)) expect(r.status).toBe(200);
    // Work done: not one byte of the flood went through JSON.parse (before issue 12, all 16 MB did).
    expect(watch.sawMarker(m)).toBe(false);
    expect(watch.bytes()).toBeLessThan(body.length);
    watch.restore();
  });
});

describe('each route reads what it needs', () => {
  it('sign-in takes a few kB: a larger body is 413 before it is parsed', async () => {
    const watch = watchParse();
    const m = newMarker();
    const r = await agent(t.app).post('/api/auth/sign-in').send({ email: 'a@b.example', password: m + 'x'.repeat(BODY_LIMITS.auth) });
    expectError(r, 413, 'payload_too_large');
    expect(watch.sawMarker(m)).toBe(false);
    watch.restore();
  });

  it('an ordinary edit (a team rename) takes 32 kB; a vehicle document takes more; past the document limit is 413', async () => {
    const owner = await signIn(t.app, 'owner@tallowmere.example');
    // Over the small limit on a small route: 413. The same size on a document route is read (and refused by its schema).
    const padded = (n: number) => ({ name: 'x'.repeat(n) });
    expectError(await owner.patch(`/api/teams/${teamId}`).send(padded(BODY_LIMITS.small)), 413, 'payload_too_large');
    expectError(await owner.post(`/api/teams/${teamId}/vehicles`).send(padded(BODY_LIMITS.small)), 400, 'invalid_input');
    // The document limit (256 kB by default, BODY_LIMIT) holds there too.
    expectError(await owner.post(`/api/teams/${teamId}/vehicles`).send(padded(300 * 1024)), 413, 'payload_too_large');
    // A trailing slash or upper case reaches the same route (Express matches both) and gets the same limit.
    expectError(await owner.post(`/api/TEAMS/${teamId}/Vehicles/`).send(padded(BODY_LIMITS.small)), 400, 'invalid_input');
  });
});
