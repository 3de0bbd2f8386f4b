/**
 * Access control over EVERY mounted API route. The routes are read from the
 * app's own router stack (listRoutes in helpers.ts); a route without a row in
 * the table below fails the first test, so a new route cannot ship without
 * someone writing down who may call it.
 *
 * The expected answers are written by hand from docs/permissions.md and
 * docs/security.md (which roles hold which permission, what a non-member,
 * an instructor and an API token get), never read from shared/schema/roles.ts
 * or the route declarations under test.
 *
 * State-changing routes are called with a probe body the route's zod schema
 * refuses: the answer is then 401/403/404 from authorisation, or 400 (415 for
 * the multipart import) once the caller got past it, and nothing is changed.
 * permissions.test.ts complements this with real bodies (the success answers).
 * One database, one seeded fixture, sessions signed in once.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { sweepCorner } from '../../shared/kinematics/sweep.js';
import { COMPUTE_KINDS } from '../../server/compute/tasks.js';
import { addMember, agent, listRoutes, registerUser, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

const WHO = [
  'anonymous',
  'owner',
  'engineer',
  'designer',
  'reviewer',
  'viewer',
  /** Kit, reviewer of Brackenfield only. */
  'otherTeam',
  /** An instructor whose programme Tallowmere has not (yet) accepted. */
  'instructorPending',
  /** Iris, whose programme Tallowmere accepted. */
  'instructorAccepted',
  /** The engineer's Tallowmere tokens. */
  'tokenRead',
  'tokenWrite',
] as const;
type Who = (typeof WHO)[number];
type Role = 'owner' | 'engineer' | 'designer' | 'reviewer' | 'viewer';
const ROLE_LIST: Role[] = ['owner', 'engineer', 'designer', 'reviewer', 'viewer'];
/** A status, or `status code` when the error code is not the usual one for the status. */
type Cell = number | `${number} ${string}`;
const USUAL_CODE: Record<number, string> = { 400: 'invalid_input', 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found', 415: 'unsupported_media_type' };

const EMAIL: Record<Exclude<Who, 'anonymous' | 'tokenRead' | 'tokenWrite' | 'instructorPending'>, string> = {
  owner: 'owner@tallowmere.example',
  engineer: 'engineer@tallowmere.example',
  designer: 'designer@tallowmere.example',
  reviewer: 'reviewer@tallowmere.example',
  viewer: 'viewer@tallowmere.example',
  otherTeam: 'reviewer@brackenfield.example',
  instructorAccepted: 'instructor@programme.example',
};

const PROBE = { notAField: true };
const SESSION_REQUIRED: Cell = '403 session_required';
const TOKEN_SCOPE: Cell = '403 token_scope';

/**
 * A team route (under /api/teams/:teamId) guarded by a permission that the
 * roles in `holders` have (docs/permissions.md). `ok` is the answer once past
 * authorisation. Rules from docs/permissions.md: anonymous 401; members
 * without the permission 403; another team's member 404; an instructor of an
 * accepted programme only the GETs team:read allows (else 404, as a
 * non-member); a token acts as its holder (the engineer), a read token never
 * changes anything (403 token_scope).
 */
function teamRoute(holders: Role[], ok: Cell, o: { method: string; teamRead?: boolean }): Record<Who, Cell> {
  const read = o.method === 'GET';
  const e: Partial<Record<Who, Cell>> = { anonymous: 401, otherTeam: 404, instructorPending: 404 };
  const cell = (r: Role): Cell => (holders.includes(r) ? ok : 403);
  for (const r of ROLE_LIST) e[r] = cell(r);
  e.instructorAccepted = read && o.teamRead ? ok : 404;
  e.tokenRead = read ? cell('engineer') : TOKEN_SCOPE;
  e.tokenWrite = cell('engineer');
  return e as Record<Who, Cell>;
}
const ALL_ROLES: Role[] = [...ROLE_LIST];
const teamRead = (method = 'GET', ok: Cell = 200) => teamRoute(ALL_ROLES, ok, { method, teamRead: true });

/** Any signed-in person (tokens: `token`). */
function signedIn(ok: Cell, token: Cell = ok): Record<Who, Cell> {
  return { anonymous: 401, owner: ok, engineer: ok, designer: ok, reviewer: ok, viewer: ok, otherTeam: ok, instructorPending: ok, instructorAccepted: ok, tokenRead: token, tokenWrite: token };
}
/** Public: the same answer for everyone (tokens: `token`). */
function everyone(ok: Cell, token: Cell = ok): Record<Who, Cell> {
  return { ...signedIn(ok, token), anonymous: ok };
}
/** Instructor-only routes of /api/programmes on Iris's programme: hers alone; everyone else 404 (someone else's programme). */
function irisOnly(ok: Cell, others: Cell = 404): Record<Who, Cell> {
  return { ...signedIn(others, others), instructorAccepted: ok };
}

let t: TestApp;
const agents = {} as Record<Exclude<Who, 'tokenRead' | 'tokenWrite'>, Agent>;
const tokens = { tokenRead: '', tokenWrite: '' };
let spareAgent: Agent;
const ids = {
  study: '',
  team: '',
  otherTeam: '',
  vehicle: '',
  design: '',
  rearDesign: '',
  otherVehicle: '',
  otherDesign: '',
  proposal: '',
  configuration: '',
  otherConfiguration: '',
  approval: '',
  comment: '',
  programme: '',
  decideProgramme: '',
  snapshot: '',
  job: '',
  spareUser: '',
  rigMeasurement: '',
  spareEmail: '',
  pendingInstructor: '',
};
const team = () => `/api/teams/${ids.team}`;
const vehicle = () => `${team()}/vehicles/${ids.vehicle}`;
const design = () => `${team()}/axle-designs/${ids.design}`;
const configuration = () => `${team()}/configurations/${ids.configuration}`;
const programme = () => `/api/programmes/${ids.programme}`;
const RANDOM_ID = '0b8c2a52-5f7e-4d8b-9a51-3c1d2e4f6a70';

async function ok(r: request.Test, status: number): Promise<request.Response> {
  const res = await r;
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  return res;
}

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { signInLimit: { windowMs: 15 * 60_000, max: 10_000 } } });
  agents.anonymous = agent(t.app);
  for (const [w, email] of Object.entries(EMAIL)) agents[w as keyof typeof EMAIL] = await signIn(t.app, email);
  const pending = await registerUser(t.app, 'Pim Instructor');
  await t.db.pool.query('UPDATE users SET instructor = true WHERE id = $1', [pending.id]);
  agents.instructorPending = pending.agent;
  ids.pendingInstructor = pending.id;

  const teams = (await ok(agents.engineer.get('/api/teams'), 200)).body as { id: string; slug: string }[];
  ids.team = teams.find((x) => x.slug === 'tallowmere')!.id;
  ids.otherTeam = teams.find((x) => x.slug === 'brackenfield')!.id;
  ids.vehicle = (await ok(agents.owner.get(`${team()}/vehicles`), 200)).body.find((v: { name: string }) => v.name === 'TUR-26 Ember').id;
  const designs = (await ok(agents.owner.get(`${vehicle()}/axle-designs`), 200)).body as { id: string; axle: string; name: string }[];
  ids.design = designs.find((d) => d.name === 'Front baseline')!.id;
  ids.rearDesign = designs.find((d) => d.name === 'Rear baseline')!.id;
  const bo = await signIn(t.app, 'owner@brackenfield.example');
  ids.otherVehicle = (await ok(bo.get(`/api/teams/${ids.otherTeam}/vehicles`), 200)).body[0].id;
  ids.otherDesign = (await ok(bo.get(`/api/teams/${ids.otherTeam}/vehicles/${ids.otherVehicle}/axle-designs`), 200)).body[0].id;
  const otherDesigns = (await ok(bo.get(`/api/teams/${ids.otherTeam}/vehicles/${ids.otherVehicle}/axle-designs`), 200)).body as { id: string; axle: string }[];
  ids.otherConfiguration = (
    await ok(
      bo.post(`/api/teams/${ids.otherTeam}/configurations`).send({
        name: 'Brackenfield access check',
        vehicleId: ids.otherVehicle,
        frontDesignId: otherDesigns.find((d) => d.axle === 'front')!.id,
        rearDesignId: otherDesigns.find((d) => d.axle === 'rear')!.id,
        trackProfile: 'smooth-circuit',
      }),
      201,
    )
  ).body.id;

  ids.proposal = (await newProposal()).id;
  // A configuration brought to approved (engineer submits, reviewer approves): gives an approval and blocks team deletion.
  ids.configuration = (
    await ok(
      agents.owner.post(`${team()}/configurations`).send({ name: 'Access check', vehicleId: ids.vehicle, frontDesignId: ids.design, rearDesignId: ids.rearDesign, trackProfile: 'smooth-circuit' }),
      201,
    )
  ).body.id;
  await ok(agents.engineer.post(`${configuration()}/submit`).send({}), 200);
  const critical = (await ok(agents.reviewer.get(`${configuration()}/gates`), 200)).body.critical as { axle: string; code: string }[];
  await ok(agents.reviewer.post(`${configuration()}/approve`).send({ acknowledgements: critical.map((c) => ({ axle: c.axle, code: c.code, reason: 'accepted for the access fixture' })) }), 200);
  ids.approval = (await ok(agents.owner.get(`${configuration()}/approvals`), 200)).body[0].id;
  ids.comment = (await ok(agents.reviewer.post(`${configuration()}/comments`).send({ body: 'Thread for the access check' }), 201)).body.id;

  // Programmes: Iris's accepted by Tallowmere, Pim's only invited, and one more of Iris's for the accept/decline rows.
  ids.programme = (await ok(agents.instructorAccepted.post('/api/programmes').send({ name: 'Access programme', trackProfile: 'smooth-circuit' }), 201)).body.id;
  await ok(agents.instructorAccepted.post(`${programme()}/teams`).send({ teamSlug: 'tallowmere' }), 201);
  await ok(agents.owner.post(`${team()}/programmes/${ids.programme}/accept`).send({}), 200);
  ids.snapshot = (await ok(agents.instructorAccepted.post(`${programme()}/snapshots`).send({ label: 'Week 1' }), 201)).body.id;
  const pim = (await ok(agents.instructorPending.post('/api/programmes').send({ name: 'Pending programme', trackProfile: 'smooth-circuit' }), 201)).body.id;
  await ok(agents.instructorPending.post(`/api/programmes/${pim}/teams`).send({ teamSlug: 'tallowmere' }), 201);
  ids.decideProgramme = (await ok(agents.instructorAccepted.post('/api/programmes').send({ name: 'Decide programme', trackProfile: 'smooth-circuit' }), 201)).body.id;
  await ok(agents.instructorAccepted.post(`/api/programmes/${ids.decideProgramme}/teams`).send({ teamSlug: 'tallowmere' }), 201);

  await mintTokens();
  ids.job = (await ok(agents.engineer.post('/api/compute/solve-jobs').send(PROBE), 202)).body.jobId;
  // A tolerance study, cancelled at once so every caller meets the same state.
  ids.study = (
    await ok(
      agents.engineer.post(`${team()}/studies`).send({
        kind: 'tolerance',
        target: { axleDesignId: ids.design },
        samples: 10,
        tolerances: [{ point: 'tieRodInner', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' }],
      }),
      202,
    )
  ).body.study.id;
  await ok(agents.engineer.delete(`${team()}/studies/${ids.study}`), 200);

  // A rig measurement of the front baseline (its own predicted toe and camber, as a rig would give them).
  const sweep = sweepCorner(exampleCorners.fsFrontWishbone, { travel: { from: -25, to: 25, step: 5 } });
  const rigFile = ['travel (mm),toe (deg),camber (deg)', ...sweep.rows.map((r) => `${r.travelMm},${r.toeDeg},${r.camberDeg}`)].join('\n');
  const mapping = { hasHeader: true, travelColumn: 0, toeColumn: 1, camberColumn: 2, travelUnit: 'mm', toeUnit: 'deg', camberUnit: 'deg', travelSign: 'bump-positive', toeSign: 'toe-in-positive', camberSign: 'top-out-positive' };
  ids.rigMeasurement = (
    await ok(
      agents.designer
        .post(`${team()}/rig-measurements`)
        .field('mapping', JSON.stringify(mapping))
        .field('target', JSON.stringify({ kind: 'baseline', designId: ids.design }))
        .attach('file', Buffer.from(rigFile), { filename: 'rig.csv', contentType: 'text/csv' }),
      201,
    )
  ).body.id;

  const spare = await registerUser(t.app, 'Spare Member');
  spareAgent = spare.agent;
  ids.spareUser = spare.id;
  ids.spareEmail = spare.email;
});
afterAll(async () => {
  await t?.close();
});

/** The engineer's read and write tokens (again after the engineer left the team, which ends them). */
async function mintTokens(): Promise<void> {
  tokens.tokenRead = (await ok(agents.engineer.post('/api/auth/tokens').send({ name: 'access read', teamId: ids.team, scope: 'read' }), 201)).body.token;
  tokens.tokenWrite = (await ok(agents.engineer.post('/api/auth/tokens').send({ name: 'access write', teamId: ids.team, scope: 'write' }), 201)).body.token;
}

async function newProposal(): Promise<{ id: string }> {
  const base = (await ok(agents.owner.get(design()), 200)).body.revision;
  return (await ok(agents.engineer.post(`${design()}/proposals`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: base }), 201)).body;
}

interface Row {
  /** `METHOD /api/path/:param` exactly as mounted. */
  route: string;
  path: () => string;
  body?: object;
  /** Runs before each caller's request (puts back what the previous caller changed). */
  beforeEach?: () => Promise<void>;
  /** Runs after each caller's request with its answer. */
  afterEach?: (who: Who, status: number) => Promise<void>;
  /** Use a freshly signed-in session per caller (the request ends it). */
  freshSession?: boolean;
  expect: Record<Who, Cell>;
}

const ROLE_OF: Partial<Record<Who, Role>> = { engineer: 'engineer', designer: 'designer', reviewer: 'reviewer', viewer: 'viewer', tokenWrite: 'engineer' };

const ROWS: Row[] = [
  { route: 'GET /api/health', path: () => '/api/health', expect: everyone(200) },

  // Account and tokens: a person's own, never a script's (docs/security.md "Personal API tokens").
  { route: 'GET /api/auth/tokens', path: () => '/api/auth/tokens', expect: signedIn(200, SESSION_REQUIRED) },
  { route: 'POST /api/auth/tokens', path: () => '/api/auth/tokens', body: PROBE, expect: signedIn(400, SESSION_REQUIRED) },
  { route: 'DELETE /api/auth/tokens/:tokenId', path: () => `/api/auth/tokens/${RANDOM_ID}`, expect: signedIn(404, SESSION_REQUIRED) },
  { route: 'GET /api/auth/me', path: () => '/api/auth/me', expect: signedIn(200) },
  { route: 'PATCH /api/auth/me', path: () => '/api/auth/me', body: PROBE, expect: signedIn(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/register', path: () => '/api/auth/register', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/sign-in', path: () => '/api/auth/sign-in', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/sign-out', path: () => '/api/auth/sign-out', freshSession: true, expect: everyone(204, SESSION_REQUIRED) },
  { route: 'POST /api/auth/change-password', path: () => '/api/auth/change-password', body: PROBE, expect: signedIn(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/password-reset', path: () => '/api/auth/password-reset', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/password-reset/confirm', path: () => '/api/auth/password-reset/confirm', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },
  { route: 'POST /api/auth/verify-email', path: () => '/api/auth/verify-email', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },
  {
    route: 'POST /api/auth/verify-email/resend',
    path: () => '/api/auth/verify-email/resend',
    // The demo seed's people have confirmed addresses (409); Pim, registered here, has not and gets a new link.
    expect: { ...signedIn('409 already_verified', SESSION_REQUIRED), instructorPending: 202 },
  },

  // Invitation links: public, the signed link is the credential; a script accepts nothing.
  { route: 'GET /api/invitations/:token', path: () => '/api/invitations/not-a-real-invitation-link', expect: everyone('404 invitation_invalid') },
  { route: 'POST /api/invitations/:token/accept', path: () => '/api/invitations/not-a-real-invitation-link/accept', body: PROBE, expect: everyone(400, SESSION_REQUIRED) },

  // Teams and members.
  { route: 'GET /api/teams', path: () => '/api/teams', expect: signedIn(200) },
  // A token is limited to its team: it creates no other team.
  { route: 'POST /api/teams', path: () => '/api/teams', body: PROBE, expect: signedIn(400, TOKEN_SCOPE) },
  { route: 'GET /api/teams/:teamId', path: team, expect: teamRead() },
  { route: 'PATCH /api/teams/:teamId', path: team, body: PROBE, expect: teamRoute(['owner'], 400, { method: 'PATCH' }) },
  // The owner gets past authorisation; the team holds an approval, so it is kept.
  { route: 'DELETE /api/teams/:teamId', path: team, expect: teamRoute(['owner'], '409 has_approvals', { method: 'DELETE' }) },
  { route: 'GET /api/teams/:teamId/members', path: () => `${team()}/members`, expect: teamRead() },
  // No POST …/members: people join only by accepting an invitation (docs/permissions.md).
  { route: 'PATCH /api/teams/:teamId/members/:userId', path: () => `${team()}/members/${ids.spareUser}`, body: PROBE, expect: teamRoute(['owner'], 400, { method: 'PATCH' }) },
  {
    route: 'DELETE /api/teams/:teamId/membership',
    path: () => `${team()}/membership`,
    // Any member may leave (team:read, a change so not by instructor or read token); the last owner may not.
    expect: { ...teamRoute(ALL_ROLES, 204, { method: 'DELETE', teamRead: true }), owner: '409 last_owner' },
    afterEach: async (who, status) => {
      const role = ROLE_OF[who];
      if (status !== 204 || !role) return;
      // Back in through an invitation, the only way in.
      await addMember(t, agents.owner, ids.team, { agent: agents[role], email: EMAIL[role] }, [role]);
      // Leaving ended the engineer's tokens for good: the rows that follow get a new pair.
      if (role === 'engineer') await mintTokens();
    },
  },
  {
    route: 'DELETE /api/teams/:teamId/members/:userId',
    path: () => `${team()}/members/${ids.spareUser}`,
    beforeEach: async () => {
      const members = (await ok(agents.owner.get(`${team()}/members`), 200)).body as { userId: string }[];
      if (!members.some((m) => m.userId === ids.spareUser)) await addMember(t, agents.owner, ids.team, { agent: spareAgent, email: ids.spareEmail }, ['viewer']);
    },
    expect: teamRoute(['owner'], 204, { method: 'DELETE' }),
  },
  { route: 'GET /api/teams/:teamId/invitations', path: () => `${team()}/invitations`, expect: teamRoute(['owner'], 200, { method: 'GET' }) },
  { route: 'POST /api/teams/:teamId/invitations', path: () => `${team()}/invitations`, body: PROBE, expect: teamRoute(['owner'], 400, { method: 'POST' }) },
  // Development servers: one's own inbox, for a signed-in person, never through a token (it holds reset links).
  { route: 'GET /api/dev/mail', path: () => '/api/dev/mail', expect: signedIn(200, SESSION_REQUIRED) },
  { route: 'GET /api/teams/:teamId/activity', path: () => `${team()}/activity`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/activity', path: () => `${design()}/activity`, expect: teamRead() },

  // Vehicles.
  { route: 'GET /api/teams/:teamId/vehicles', path: () => `${team()}/vehicles`, expect: teamRead() },
  { route: 'POST /api/teams/:teamId/vehicles', path: () => `${team()}/vehicles`, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'POST' }) },
  { route: 'GET /api/teams/:teamId/vehicles/:vehicleId', path: vehicle, expect: teamRead() },
  { route: 'PATCH /api/teams/:teamId/vehicles/:vehicleId', path: vehicle, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'PATCH' }) },
  { route: 'PUT /api/teams/:teamId/vehicles/:vehicleId/data', path: () => `${vehicle()}/data`, body: PROBE, expect: teamRoute(['engineer'], 400, { method: 'PUT' }) },
  { route: 'GET /api/teams/:teamId/vehicles/:vehicleId/revisions', path: () => `${vehicle()}/revisions`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/vehicles/:vehicleId/compare', path: () => `${vehicle()}/compare?from=1&to=1`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/vehicles/:vehicleId/revisions/:revision', path: () => `${vehicle()}/revisions/1`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/vehicles/:vehicleId/axle-designs', path: () => `${vehicle()}/axle-designs`, expect: teamRead() },
  {
    route: 'POST /api/teams/:teamId/vehicles/:vehicleId/axle-designs',
    path: () => `${vehicle()}/axle-designs`,
    body: PROBE,
    expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'POST' }),
  },

  // Axle designs and proposals.
  { route: 'GET /api/teams/:teamId/axle-designs/:designId', path: design, expect: teamRead() },
  { route: 'PATCH /api/teams/:teamId/axle-designs/:designId', path: design, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'PATCH' }) },
  { route: 'PUT /api/teams/:teamId/axle-designs/:designId/corner', path: () => `${design()}/corner`, body: PROBE, expect: teamRoute(['designer'], 400, { method: 'PUT' }) },
  // JSON instead of the multipart file: past authorisation the upload check refuses it.
  { route: 'POST /api/teams/:teamId/axle-designs/:designId/import', path: () => `${design()}/import`, body: PROBE, expect: teamRoute(['designer'], 415, { method: 'POST' }) },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/revisions', path: () => `${design()}/revisions`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/compare', path: () => `${design()}/compare?from=1&to=1`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/revisions/:revision', path: () => `${design()}/revisions/1`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/proposals', path: () => `${design()}/proposals`, expect: teamRead() },
  { route: 'POST /api/teams/:teamId/axle-designs/:designId/proposals', path: () => `${design()}/proposals`, body: PROBE, expect: teamRoute(['engineer'], 400, { method: 'POST' }) },
  { route: 'GET /api/teams/:teamId/axle-designs/:designId/proposals/:proposalId', path: () => `${design()}/proposals/${ids.proposal}`, expect: teamRead() },
  {
    route: 'POST /api/teams/:teamId/axle-designs/:designId/proposals/:proposalId/accept',
    path: () => `${design()}/proposals/${ids.proposal}/accept`,
    body: PROBE,
    expect: teamRoute(['designer'], 400, { method: 'POST' }),
  },
  {
    route: 'POST /api/teams/:teamId/axle-designs/:designId/proposals/:proposalId/reject',
    path: () => `${design()}/proposals/${ids.proposal}/reject`,
    body: PROBE,
    expect: teamRoute(['designer'], 400, { method: 'POST' }),
  },
  {
    route: 'DELETE /api/teams/:teamId/axle-designs/:designId/proposals/:proposalId',
    path: () => `${design()}/proposals/${ids.proposal}`,
    // A fresh proposal of the engineer's each time: they (and their write token) withdraw it.
    beforeEach: async () => {
      ids.proposal = (await newProposal()).id;
    },
    expect: teamRoute(['engineer'], 200, { method: 'DELETE' }),
  },

  // Configurations and review.
  { route: 'GET /api/teams/:teamId/configurations', path: () => `${team()}/configurations`, expect: teamRead() },
  { route: 'POST /api/teams/:teamId/configurations', path: () => `${team()}/configurations`, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'POST' }) },
  {
    route: 'GET /api/teams/:teamId/configurations/compare',
    path: () => `${team()}/configurations/compare?a=${ids.configuration}&b=${ids.configuration}`,
    expect: teamRead(),
  },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId', path: configuration, expect: teamRead() },
  { route: 'PUT /api/teams/:teamId/configurations/:configurationId', path: configuration, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'PUT' }) },
  { route: 'PATCH /api/teams/:teamId/configurations/:configurationId', path: configuration, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 400, { method: 'PATCH' }) },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/revisions', path: () => `${configuration()}/revisions`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/history', path: () => `${configuration()}/history`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/results', path: () => `${configuration()}/results`, expect: teamRead() },
  ...(['submit', 'withdraw'] as const).map(
    (a): Row => ({ route: `POST /api/teams/:teamId/configurations/:configurationId/${a}`, path: () => `${configuration()}/${a}`, body: PROBE, expect: teamRoute(['engineer', 'designer'], 400, { method: 'POST' }) }),
  ),
  ...(['approve', 'request-changes', 'release', 'validate'] as const).map(
    (a): Row => ({ route: `POST /api/teams/:teamId/configurations/:configurationId/${a}`, path: () => `${configuration()}/${a}`, body: PROBE, expect: teamRoute(['reviewer'], 400, { method: 'POST' }) }),
  ),
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/approvals', path: () => `${configuration()}/approvals`, expect: teamRead() },
  // Sign-off gates, the latest-revisions preview and the review record: team:read (docs/permissions.md). The page and the
  // PDF are called with a revision the query schema refuses: 400 once past authorisation, and no browser is started.
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/gates', path: () => `${configuration()}/gates`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/latest-preview', path: () => `${configuration()}/latest-preview`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/record', path: () => `${configuration()}/record`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/record.html', path: () => `${configuration()}/record.html?revision=none`, expect: teamRead('GET', 400) },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/record.pdf', path: () => `${configuration()}/record.pdf?revision=none`, expect: teamRead('GET', 400) },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/approvals/:approvalId', path: () => `${configuration()}/approvals/${ids.approval}`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/configurations/:configurationId/comments', path: () => `${configuration()}/comments`, expect: teamRead() },
  {
    route: 'POST /api/teams/:teamId/configurations/:configurationId/comments',
    path: () => `${configuration()}/comments`,
    body: PROBE,
    expect: teamRoute(['owner', 'engineer', 'designer', 'reviewer'], 400, { method: 'POST' }),
  },
  ...(['resolve', 'reopen'] as const).map(
    (a): Row => ({
      route: `POST /api/teams/:teamId/configurations/:configurationId/comments/:commentId/${a}`,
      path: () => `${configuration()}/comments/${ids.comment}/${a}`,
      expect: teamRoute(['owner', 'engineer', 'designer', 'reviewer'], 200, { method: 'POST' }),
    }),
  ),

  // Rig measurements and the team's rig tolerance.
  // JSON instead of the multipart file: past authorisation the upload check refuses it (nothing stored).
  { route: 'POST /api/teams/:teamId/rig-measurements/preview', path: () => `${team()}/rig-measurements/preview`, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 415, { method: 'POST' }) },
  { route: 'POST /api/teams/:teamId/rig-measurements', path: () => `${team()}/rig-measurements`, body: PROBE, expect: teamRoute(['owner', 'engineer', 'designer'], 415, { method: 'POST' }) },
  { route: 'GET /api/teams/:teamId/rig-measurements', path: () => `${team()}/rig-measurements`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/rig-measurements/:measurementId', path: () => `${team()}/rig-measurements/${ids.rigMeasurement}`, expect: teamRead() },
  // An id that does not exist: past authorisation it is 404, short of it 403 (nothing deleted either way).
  // Studies (docs/permissions.md): study:run (engineer, designer) starts and cancels; team:read reads; a sweep variant becomes a proposal with design:propose.
  { route: 'POST /api/teams/:teamId/studies', path: () => `${team()}/studies`, body: PROBE, expect: teamRoute(['engineer', 'designer'], 400, { method: 'POST' }) },
  { route: 'GET /api/teams/:teamId/studies', path: () => `${team()}/studies`, expect: teamRead() },
  { route: 'GET /api/teams/:teamId/studies/:studyId', path: () => `${team()}/studies/${ids.study}`, expect: teamRead() },
  // Cancelling a cancelled study answers the study as it is.
  { route: 'DELETE /api/teams/:teamId/studies/:studyId', path: () => `${team()}/studies/${ids.study}`, expect: teamRoute(['engineer', 'designer'], 200, { method: 'DELETE' }) },
  { route: 'GET /api/teams/:teamId/studies/:studyId/csv', path: () => `${team()}/studies/${ids.study}/csv`, expect: teamRead('GET', '409 study_not_completed') },
  {
    route: 'POST /api/teams/:teamId/studies/:studyId/variants/:index/proposal',
    path: () => `${team()}/studies/${ids.study}/variants/0/proposal`,
    expect: teamRoute(['engineer'], '409 not_a_sweep', { method: 'POST' }),
  },
  // Attaching needs a completed study (the probe's is cancelled); detaching an attachment that does not exist is 404.
  {
    route: 'PUT /api/teams/:teamId/studies/:studyId/attachments/:configurationId',
    path: () => `${team()}/studies/${ids.study}/attachments/${ids.configuration}`,
    body: { note: 'probe' },
    expect: teamRoute(['engineer', 'designer'], '409 study_not_completed', { method: 'PUT' }),
  },
  {
    route: 'DELETE /api/teams/:teamId/studies/:studyId/attachments/:configurationId',
    path: () => `${team()}/studies/${ids.study}/attachments/${ids.configuration}`,
    expect: teamRoute(['engineer', 'designer'], 404, { method: 'DELETE' }),
  },
  { route: 'GET /api/programmes/:programmeId/studies', path: () => `${programme()}/studies`, expect: irisOnly(200) },
  { route: 'DELETE /api/teams/:teamId/rig-measurements/:measurementId', path: () => `${team()}/rig-measurements/${RANDOM_ID}`, expect: teamRoute(['owner', 'engineer', 'designer'], 404, { method: 'DELETE' }) },
  { route: 'GET /api/teams/:teamId/rig-tolerance', path: () => `${team()}/rig-tolerance`, expect: teamRead() },
  { route: 'PUT /api/teams/:teamId/rig-tolerance', path: () => `${team()}/rig-tolerance`, body: PROBE, expect: teamRoute(['owner'], 400, { method: 'PUT' }) },

  // Programmes: the team's owner decides; instructors run their own.
  { route: 'GET /api/teams/:teamId/programmes', path: () => `${team()}/programmes`, expect: teamRoute(['owner'], 200, { method: 'GET' }) },
  ...(['accept', 'decline'] as const).map(
    (a): Row => ({
      route: `POST /api/teams/:teamId/programmes/:programmeId/${a}`,
      path: () => `${team()}/programmes/${ids.decideProgramme}/${a}`,
      expect: teamRoute(['owner'], 200, { method: 'POST' }),
    }),
  ),
  // Everyone signed in lists their own programmes (none unless an instructor).
  { route: 'GET /api/programmes', path: () => '/api/programmes', expect: signedIn(200) },
  // The instructor-only routes check the body before the caller, so these rows send valid bodies.
  {
    route: 'POST /api/programmes',
    path: () => '/api/programmes',
    body: { name: 'Access row programme', trackProfile: 'smooth-circuit' },
    expect: { ...signedIn(403, TOKEN_SCOPE), instructorPending: 201, instructorAccepted: 201 },
  },
  { route: 'GET /api/programmes/:programmeId', path: programme, expect: irisOnly(200) },
  // Iris invites Brackenfield once (201); for everyone else her programme does not exist.
  {
    route: 'POST /api/programmes/:programmeId/teams',
    path: () => `${programme()}/teams`,
    body: { teamSlug: 'brackenfield' },
    expect: { ...irisOnly(201), tokenRead: TOKEN_SCOPE, tokenWrite: TOKEN_SCOPE },
  },
  { route: 'GET /api/programmes/:programmeId/board', path: () => `${programme()}/board`, expect: irisOnly(200) },
  {
    route: 'POST /api/programmes/:programmeId/snapshots',
    path: () => `${programme()}/snapshots`,
    body: { label: 'Access row' },
    expect: { ...irisOnly(201), tokenRead: TOKEN_SCOPE, tokenWrite: TOKEN_SCOPE },
  },
  { route: 'GET /api/programmes/:programmeId/snapshots', path: () => `${programme()}/snapshots`, expect: irisOnly(200) },
  { route: 'GET /api/programmes/:programmeId/snapshots/:snapshotId', path: () => `${programme()}/snapshots/${ids.snapshot}`, expect: irisOnly(200) },

  // Compute: any signed-in person or token (read tokens included); it stores nothing. Jobs are their starter's.
  // docs/permissions.md has one wildcard row for the engine calls (`POST /api/compute/*`: signed in), so every kind the pool runs gets it.
  ...COMPUTE_KINDS.map((k): Row => ({ route: `POST /api/compute/${k}`, path: () => `/api/compute/${k}`, body: PROBE, expect: signedIn(400) })),
  { route: 'POST /api/compute/solve-jobs', path: () => '/api/compute/solve-jobs', body: PROBE, expect: signedIn(202) },
  { route: 'GET /api/compute/solve-jobs/:jobId', path: () => `/api/compute/solve-jobs/${ids.job}`, expect: { ...signedIn(404), engineer: 200, tokenRead: 200, tokenWrite: 200 } },
  { route: 'DELETE /api/compute/solve-jobs/:jobId', path: () => `/api/compute/solve-jobs/${RANDOM_ID}`, expect: signedIn(404) },
];

/** The request of `who` for a row: a session agent, or a script with a bearer token (no cookie, no CSRF header). */
async function call(who: Who, row: Row): Promise<request.Response> {
  const m = row.route.split(' ')[0]!.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  let req: request.Test;
  if (who === 'tokenRead' || who === 'tokenWrite') {
    req = request(t.app)[m](row.path()).set('Authorization', `Bearer ${tokens[who]}`);
  } else if (row.freshSession && who !== 'anonymous') {
    const a = who === 'instructorPending' ? agent(t.app) : await signIn(t.app, EMAIL[who]);
    req = a[m](row.path());
  } else {
    req = agents[who][m](row.path());
  }
  if (row.body) req = req.send(row.body);
  return req;
}

const key = (r: { method: string; path: string }) => `${r.method} ${r.path}`;

describe('every mounted API route has an access row', () => {
  it('the router and the table list the same routes', () => {
    const mounted = listRoutes(t.app)
      .filter((r) => r.path.startsWith('/api/'))
      .map(key);
    expect(mounted.length).toBeGreaterThan(80);
    const table = ROWS.map((r) => r.route);
    expect(new Set(table).size, 'a route appears twice in the table').toBe(table.length);
    expect(
      mounted.filter((r) => !table.includes(r)),
      'mounted routes without an expected-access row',
    ).toEqual([]);
    expect(
      table.filter((r) => !mounted.includes(r)),
      'table rows for routes that are not mounted',
    ).toEqual([]);
  });
});

describe('who gets what, route by route', () => {
  for (const row of ROWS) {
    it(row.route, async () => {
      const got: Partial<Record<Who, Cell>> = {};
      const want: Partial<Record<Who, Cell>> = {};
      for (const who of WHO) {
        await row.beforeEach?.();
        const r = await call(who, row);
        const expected = row.expect[who];
        const [status, code] = String(expected).split(' ');
        // Record the status, with the error code when it differs from the usual one for the status.
        got[who] = r.status >= 400 && r.body?.error?.code !== USUAL_CODE[r.status] ? `${r.status} ${r.body?.error?.code}` : r.status;
        want[who] = code === undefined ? Number(status) : expected;
        if (r.status >= 400) expect(typeof r.body?.error?.message, `${who}: error shape`).toBe('string');
        await row.afterEach?.(who, r.status);
      }
      expect(got).toEqual(want);
    });
  }
});

describe("another team's ids, guessed or swapped in, are not found", () => {
  const other = () => `/api/teams/${ids.otherTeam}`;

  it('in the URL: the answer is the same as for an id that does not exist', async () => {
    const pairs: [string, string][] = [
      [`${team()}/vehicles/${ids.otherVehicle}`, `${team()}/vehicles/${RANDOM_ID}`],
      [`${team()}/vehicles/${ids.otherVehicle}/revisions`, `${team()}/vehicles/${RANDOM_ID}/revisions`],
      [`${team()}/vehicles/${ids.otherVehicle}/axle-designs`, `${team()}/vehicles/${RANDOM_ID}/axle-designs`],
      [`${team()}/axle-designs/${ids.otherDesign}`, `${team()}/axle-designs/${RANDOM_ID}`],
      [`${team()}/axle-designs/${ids.otherDesign}/activity`, `${team()}/axle-designs/${RANDOM_ID}/activity`],
      [`${team()}/configurations/${ids.otherConfiguration}`, `${team()}/configurations/${RANDOM_ID}`],
      [`${team()}/configurations/${ids.otherConfiguration}/results`, `${team()}/configurations/${RANDOM_ID}/results`],
      // A team one is not in answers like a team that does not exist.
      [`${other()}/vehicles`, `/api/teams/${RANDOM_ID}/vehicles`],
    ];
    for (const [swapped, guessed] of pairs) {
      const a = await agents.designer.get(swapped);
      const b = await agents.designer.get(guessed);
      expect(a.status, swapped).toBe(404);
      expect(a.body, swapped).toEqual(b.body);
    }
    // Writes too: the designer edits hardpoints, but not another team's design through their own team's path.
    const corner = await agents.designer.put(`${team()}/axle-designs/${ids.otherDesign}/corner`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: 1 });
    expect(corner.status).toBe(404);
    const proposal = await agents.engineer.post(`${team()}/axle-designs/${ids.otherDesign}/proposals`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: 1 });
    expect(proposal.status).toBe(404);
    const comment = await agents.reviewer.post(`${team()}/configurations/${ids.otherConfiguration}/comments`).send({ body: 'hello' });
    expect(comment.status).toBe(404);
  });

  it('in bodies, queries and upload fields: no configuration, token, reply, compare or rig measurement reaches another team’s records', async () => {
    const body = { name: 'Swapped', vehicleId: ids.vehicle, frontDesignId: ids.design, rearDesignId: ids.rearDesign, trackProfile: 'smooth-circuit' };
    for (const swap of [{ vehicleId: ids.otherVehicle }, { frontDesignId: ids.otherDesign }, { rearDesignId: ids.otherDesign }]) {
      const swapped = await agents.engineer.post(`${team()}/configurations`).send({ ...body, ...swap });
      const guessed = await agents.engineer.post(`${team()}/configurations`).send({ ...body, ...Object.fromEntries(Object.keys(swap).map((k) => [k, RANDOM_ID])) });
      expect(swapped.status, JSON.stringify(swap)).toBe(404);
      expect(swapped.body).toEqual(guessed.body);
    }
    const revise = await agents.engineer.put(configuration()).send({ baseRevision: 1, vehicleId: ids.otherVehicle });
    expect(revise.status).toBe(404);
    // The designer is not in Brackenfield: no token for it, and no telling whether it exists.
    const tok = await agents.designer.post('/api/auth/tokens').send({ name: 'swap', teamId: ids.otherTeam, scope: 'read' });
    const tokGuess = await agents.designer.post('/api/auth/tokens').send({ name: 'swap', teamId: RANDOM_ID, scope: 'read' });
    expect(tok.status).toBe(404);
    expect(tok.body).toEqual(tokGuess.body);
    // A reply under another configuration cannot hang on this configuration's thread.
    const second = (await ok(agents.engineer.post(`${team()}/configurations`).send({ ...body, name: 'Second' }), 201)).body.id;
    const reply = await agents.reviewer.post(`${team()}/configurations/${second}/comments`).send({ body: 'reply', parentId: ids.comment });
    expect(reply.status, JSON.stringify(reply.body)).toBe(404);
    const otherTeamReply = await agents.reviewer.post(`${team()}/configurations/${second}/comments`).send({ body: 'reply', parentId: RANDOM_ID });
    expect(reply.body).toEqual(otherTeamReply.body);
    // In a query: comparing with another team's configuration.
    const cmp = await agents.engineer.get(`${team()}/configurations/compare?a=${ids.configuration}&b=${ids.otherConfiguration}`);
    const cmpGuess = await agents.engineer.get(`${team()}/configurations/compare?a=${ids.configuration}&b=${RANDOM_ID}`);
    expect(cmp.status).toBe(404);
    expect(cmp.body).toEqual(cmpGuess.body);
    // In an upload's fields: a rig measurement compared with another team's design; nothing is stored.
    const rigCount = async () => Number((await t.db.pool.query('SELECT count(*) FROM rig_measurements')).rows[0].count);
    const rigBefore = await rigCount();
    const rig = (designId: string) =>
      agents.designer
        .post(`${team()}/rig-measurements`)
        .field('mapping', JSON.stringify({ hasHeader: true, travelColumn: 0, toeColumn: 1, camberColumn: null, travelUnit: 'mm', toeUnit: 'deg', camberUnit: 'deg', travelSign: 'bump-positive', toeSign: 'toe-in-positive', camberSign: 'top-out-positive' }))
        .field('target', JSON.stringify({ kind: 'baseline', designId }))
        .attach('file', Buffer.from('travel (mm),toe (deg)\n-20,0\n-10,0\n0,0\n10,0\n20,0\n'), { filename: 'rig.csv', contentType: 'text/csv' });
    const rigSwapped = await rig(ids.otherDesign);
    const rigGuessed = await rig(RANDOM_ID);
    expect(rigSwapped.status, JSON.stringify(rigSwapped.body)).toBe(404);
    expect(rigSwapped.body).toEqual(rigGuessed.body);
    expect(await rigCount()).toBe(rigBefore);
    // A member id of someone outside the team.
    const kit = (await ok(agents.otherTeam.get('/api/auth/me'), 200)).body.user.id;
    const member = await agents.owner.patch(`${team()}/members/${kit}`).send({ roles: ['viewer'] });
    expect(member.status).toBe(404);
  });

  it('an API token cannot accept an invitation (account management needs a session); the link stays usable', async () => {
    await ok(agents.owner.post(`${team()}/invitations`).send({ email: 'token-invitee@test.example', roles: ['viewer'] }), 201);
    const mail = await t.db.pool.query<{ text_body: string }>("SELECT text_body FROM mail_outbox WHERE to_address = 'token-invitee@test.example'");
    const link = /\/invitations\/([A-Za-z0-9_.-]+)/.exec(mail.rows[0]!.text_body)![1]!;
    for (const tok of [tokens.tokenRead, tokens.tokenWrite]) {
      const r = await request(t.app).post(`/api/invitations/${link}/accept`).set('Authorization', `Bearer ${tok}`).send({ displayName: 'Scripted', password: 'long-enough-pass' });
      expect(r.status, JSON.stringify(r.body)).toBe(403);
      expect(r.body.error.code).toBe('session_required');
    }
    expect((await ok(agent(t.app).get(`/api/invitations/${link}`), 200)).body).toMatchObject({ email: 'token-invitee@test.example', roles: ['viewer'] });
  });

  it('spelling a path in capitals (Express routes ignore case) does not let a token reach account or token management', async () => {
    const cases: [string, string, object?][] = [
      ['get', '/api/AUTH/tokens'],
      ['post', '/api/Auth/tokens', { name: 'minted', teamId: ids.team, scope: 'write' }],
      ['patch', '/api/Auth/Me', { displayName: 'Renamed by a script' }],
      ['post', '/api/INVITATIONS/not-a-real-invitation-link/accept', { displayName: 'X', password: 'long-enough-pass' }],
    ];
    for (const [method, path, body] of cases) {
      const req = request(t.app)[method as 'get' | 'post' | 'patch'](path).set('Authorization', `Bearer ${tokens.tokenRead}`);
      const r = await (body ? req.send(body) : req);
      expect(`${r.status} ${r.body?.error?.code}`, `${method} ${path}`).toBe('403 session_required');
    }
  });

  it('a token for one team reaches nothing of another, even where its holder is a member', async () => {
    // The engineer is also in Brackenfield; the token is for Tallowmere.
    const r = await request(t.app).get(`${other()}/vehicles`).set('Authorization', `Bearer ${tokens.tokenWrite}`);
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('token_scope');
  });
});
