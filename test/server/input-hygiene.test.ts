/**
 * Bad text never becomes a 500 and secrets never reach the log (issue 12 §6):
 * a NUL character in any text field is a 400 naming the field (PostgreSQL
 * cannot store U+0000; before, each of these was a 500 whose log line held
 * the failed INSERT's parameters, a password hash among them); the error
 * log keeps what failed, never the values; request URLs are logged without
 * their query string or link tokens.
 */
import { Writable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { users } from '../../server/db/schema.js';
import { createLogger, errorForLog, loggableUrl } from '../../server/http/logging.js';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { agent, expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let owner: Agent;
let teamId = '';
const team = () => `/api/teams/${teamId}`;
beforeAll(async () => {
  t = await startTestApp({ seed: true });
  owner = await signIn(t.app, 'owner@tallowmere.example');
  teamId = await idOf(owner, '/api/teams', 'tallowmere');
});
afterAll(async () => {
  await t?.close();
});

const NUL = '\u0000';

/** The first axle design of the team's first vehicle. */
async function firstDesign(): Promise<{ id: string }> {
  const vehicleId = (await owner.get(`${team()}/vehicles`).expect(200)).body[0].id;
  return (await owner.get(`${team()}/vehicles/${vehicleId}/axle-designs`).expect(200)).body[0];
}

/** 400 invalid_input whose fields include `path`, said to hold a NUL character. */
function expectNulRefused(r: request.Response, path: string): void {
  expectError(r, 400, 'invalid_input');
  const fields = r.body.error.details.fields as { path: string; message: string }[];
  expect(fields.find((f) => f.path === path), JSON.stringify(r.body)).toMatchObject({ message: expect.stringMatching(/NUL/) });
}

describe('a NUL character in a text field is a 400 naming the field', () => {
  it('display name at registration and on the profile', async () => {
    const email = `nul-${Date.now()}@test.example`;
    expectNulRefused(await agent(t.app).post('/api/auth/register').send({ email, password: 'long-enough-pass', displayName: `Ann${NUL}` }), 'displayName');
    expectNulRefused(await owner.patch('/api/auth/me').send({ displayName: `Own${NUL}er` }), 'displayName');
  });

  it('team, vehicle and axle-design names', async () => {
    expectNulRefused(await owner.post('/api/teams').send({ name: `Team${NUL}`, slug: `nul-team-${Date.now()}` }), 'name');
    expectNulRefused(await owner.post(`${team()}/vehicles`).send({ name: `Car${NUL}` }), 'name');
    const vehicleId = (await owner.get(`${team()}/vehicles`).expect(200)).body[0].id;
    expectNulRefused(await owner.post(`${team()}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'front', name: 'Front', corner: { ...exampleCorners.fsFrontWishbone, name: `Corner${NUL}` } }), 'corner.name');
  });

  it('a review comment and a proposal note', async () => {
    const configurationId = (await owner.get(`${team()}/configurations`).expect(200)).body[0].id;
    expectNulRefused(await owner.post(`${team()}/configurations/${configurationId}/comments`).send({ body: `Looks ${NUL}fine` }), 'body');
    const design = await firstDesign();
    const full = (await owner.get(`${team()}/axle-designs/${design.id}`).expect(200)).body;
    const r = await owner.post(`${team()}/axle-designs/${design.id}/proposals`).send({ corner: full.corner, baseRevision: full.revision, message: `raise${NUL}` });
    expectNulRefused(r, 'message');
  });

  it('keys and nested values are named by their path; a query parameter by its name', async () => {
    expectNulRefused(await owner.post(`${team()}/vehicles`).send({ name: 'Car', data: { front: { tyre: [`a`, `b${NUL}`] } } }), 'data.front.tyre[1]');
    expectNulRefused(await owner.get(`${team()}/vehicles?archived=tr%00ue`), 'archived');
  });

  it('the text fields of an upload, raw or inside their JSON', async () => {
    const design = await firstDesign();
    const designer = await signIn(t.app, 'designer@tallowmere.example');
    const upload = (fields: Record<string, string>) => {
      let req = designer.post(`${team()}/axle-designs/${design.id}/import`);
      for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
      return req.attach('file', Buffer.from('point,x,y,z\n'), { filename: 'points.csv', contentType: 'text/csv' });
    };
    expectNulRefused(await upload({ frame: `{"name":"cad${NUL}"}` }), 'frame');
    expectNulRefused(await upload({ frame: '{"name":"cad\\u0000"}' }), 'frame.name');
  });

  it('a backslash followed by "u0000" is text, not a NUL', async () => {
    const r = await owner.post(`${team()}/vehicles`).send({ name: 'Car \\u0000 spec' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    expect(r.body.name).toBe('Car \\u0000 spec');
  });
});

describe('nothing secret in the log', () => {
  it('a failed query is logged with its SQL and error code, never its parameters (the password hash was among them)', async () => {
    const hash = '$2a$04$abcdefghijklmnopqrstuvSECRETHASHSECRETHASHSECRETHASH12';
    let failure: unknown;
    try {
      await t.db.orm.insert(users).values({ email: `log-${Date.now()}@test.example`, displayName: `x${NUL}`, passwordHash: hash });
    } catch (e) {
      failure = e;
    }
    expect(failure).toBeInstanceOf(Error);
    expect(String((failure as Error).message)).toContain(hash); // Drizzle puts the parameters in its message
    const lines: string[] = [];
    const sink = new Writable({
      write(chunk, _enc, done) {
        lines.push(String(chunk));
        done();
      },
    });
    createLogger('info', sink).error({ err: failure }, 'request failed');
    const logged = lines.join('');
    const record = JSON.parse(logged) as { err: { query: string; message: string; cause: { code: string } } };
    expect(record.err.query).toMatch(/insert into "users"/);
    expect(record.err.message).toMatch(/params: \[not logged\]/);
    expect(record.err.cause.code).toBe('22021');
    expect(logged).not.toContain(hash);
    expect(logged).not.toContain('SECRETHASH');
    expect(JSON.stringify(errorForLog(failure))).not.toContain('SECRETHASH');
  });

  it('request URLs are logged without the query string or an invitation link token', () => {
    expect(loggableUrl('/api/teams/x/activity?format=csv&timeZone=Europe%2FLondon')).toBe('/api/teams/x/activity');
    expect(loggableUrl('/api/invitations/eyJ0ZWFtIjoiYSJ9.c2lnbmF0dXJl/accept?x=1')).toBe('/api/invitations/[token]/accept');
    expect(loggableUrl('/api/INVITATIONS/abc')).toBe('/api/INVITATIONS/[token]');
  });
});
