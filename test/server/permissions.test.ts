/**
 * Role × route matrix with real bodies: the success answers (200/201/204)
 * of each role. The expected statuses are written out here by hand from the
 * permission table (docs/permissions.md), not read from the server's route
 * declarations, so a route guarded with the wrong permission fails this
 * test. access-routes.test.ts covers every mounted route (read from the
 * router) for more callers: another team, instructors, API tokens.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { ROLE_PERMISSIONS } from '../../server/permissions.js';
import { addMember, agent, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

type Who = 'owner' | 'engineer' | 'designer' | 'reviewer' | 'viewer' | 'nonMember' | 'anonymous';
const WHO: Who[] = ['owner', 'engineer', 'designer', 'reviewer', 'viewer', 'nonMember', 'anonymous'];
const EMAIL: Record<Exclude<Who, 'anonymous'>, string> = {
  owner: 'owner@tallowmere.example',
  engineer: 'engineer@tallowmere.example',
  designer: 'designer@tallowmere.example',
  reviewer: 'reviewer@tallowmere.example',
  viewer: 'viewer@tallowmere.example',
  nonMember: 'reviewer@brackenfield.example',
};

let t: TestApp;
const agents = {} as Record<Who, Agent>;
let teamId = '';
let vehicleId = '';
let designId = '';
let viewerId = '';
let instructorEmail = 'instructor@programme.example';
let instructorId = '';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  for (const w of WHO) agents[w] = w === 'anonymous' ? agent(t.app) : await signIn(t.app, EMAIL[w]);
  const teams = await agents.owner.get('/api/teams').expect(200);
  teamId = teams.body.find((x: { slug: string }) => x.slug === 'tallowmere').id;
  const vehicles = await agents.owner.get(`/api/teams/${teamId}/vehicles`).expect(200);
  vehicleId = vehicles.body.find((v: { name: string }) => v.name === 'TUR-26 Ember').id;
  const designs = await agents.owner.get(`/api/teams/${teamId}/vehicles/${vehicleId}/axle-designs`).expect(200);
  designId = designs.body.find((d: { axle: string }) => d.axle === 'front').id;
  const members = await agents.owner.get(`/api/teams/${teamId}/members`).expect(200);
  viewerId = members.body.find((m: { email: string }) => m.email === EMAIL.viewer).userId;
  const inst = await signIn(t.app, instructorEmail);
  instructorId = (await inst.get('/api/auth/me')).body.user.id;
});
afterAll(async () => {
  await t?.close();
});

async function currentRevision(path: string): Promise<number> {
  return (await agents.owner.get(path).expect(200)).body.revision as number;
}

interface Row {
  name: string;
  method: 'get' | 'post' | 'patch' | 'put' | 'delete';
  path: () => string;
  body?: () => Promise<unknown> | unknown;
  /** A file sent as multipart/form-data in field `file` (instead of a JSON body). */
  upload?: () => { name: string; text: string };
  /** Text fields sent beside `upload` (multipart). */
  fields?: () => Record<string, string>;
  /** Runs once before the row (e.g. creates the proposal it acts on). */
  before?: () => Promise<void>;
  /** Runs before each caller's request (e.g. a fresh configuration in the state the transition starts from). */
  beforeEach?: () => Promise<void>;
  expect: Record<Who, number>;
}

const team = () => `/api/teams/${teamId}`;
const vehicle = () => `${team()}/vehicles/${vehicleId}`;
const design = () => `${team()}/axle-designs/${designId}`;
let configurationId = '';
let approvalId = '';
let commentId = '';
const configuration = () => `${team()}/configurations/${configurationId}`;

//                          owner engineer designer reviewer viewer nonMember anonymous
const REVIEW_SUBMIT = { owner: 403, engineer: 200, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 };
const REVIEW_DECIDE = { owner: 403, engineer: 403, designer: 403, reviewer: 200, viewer: 403, nonMember: 404, anonymous: 401 };
const MANAGE = { owner: 200, engineer: 200, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 };
const READ = { owner: 200, engineer: 200, designer: 200, reviewer: 200, viewer: 200, nonMember: 404, anonymous: 401 };

const ROWS: Row[] = [
  { name: 'read team', method: 'get', path: team, expect: READ },
  {
    name: 'rename team',
    method: 'patch',
    path: team,
    body: () => ({ name: 'Tallowmere University Racing' }),
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'list members', method: 'get', path: () => `${team()}/members`, expect: READ },
  // There is no direct "add member": people join by accepting an invitation (below).
  {
    name: 'change member roles',
    method: 'patch',
    path: () => `${team()}/members/${viewerId}`,
    body: () => ({ roles: ['viewer'] }),
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'remove member',
    method: 'delete',
    path: () => `${team()}/members/${instructorId}`,
    // Iris joins first, the only way there is: invited, she accepts.
    before: async () => {
      const iris = await signIn(t.app, instructorEmail);
      await addMember(t, agents.owner, teamId, { agent: iris, email: instructorEmail }, ['viewer']);
    },
    expect: { owner: 204, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'list vehicles', method: 'get', path: () => `${team()}/vehicles`, expect: READ },
  {
    name: 'create vehicle',
    method: 'post',
    path: () => `${team()}/vehicles`,
    body: () => ({ name: 'Matrix test car' }),
    expect: { owner: 201, engineer: 201, designer: 201, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'read vehicle', method: 'get', path: vehicle, expect: READ },
  {
    name: 'rename vehicle',
    method: 'patch',
    path: vehicle,
    body: async () => ({ name: 'TUR-26 Ember', baseRevision: await currentRevision(vehicle()) }),
    expect: { owner: 200, engineer: 200, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'edit vehicle data',
    method: 'put',
    path: () => `${vehicle()}/data`,
    body: async () => ({ data: exampleVehicles.tur26Ember, baseRevision: await currentRevision(vehicle()) }),
    expect: { owner: 403, engineer: 200, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'vehicle revisions', method: 'get', path: () => `${vehicle()}/revisions`, expect: READ },
  { name: 'compare vehicle revisions', method: 'get', path: () => `${vehicle()}/compare?from=1&to=1`, expect: READ },
  { name: 'list axle designs', method: 'get', path: () => `${vehicle()}/axle-designs`, expect: READ },
  {
    name: 'create axle design',
    method: 'post',
    path: () => `${vehicle()}/axle-designs`,
    body: () => ({ axle: 'front', name: 'Matrix variant', corner: exampleCorners.fsFrontWishbone }),
    expect: { owner: 201, engineer: 201, designer: 201, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'read axle design', method: 'get', path: design, expect: READ },
  {
    name: 'rename axle design',
    method: 'patch',
    path: design,
    body: async () => ({ name: 'Front baseline', baseRevision: await currentRevision(design()) }),
    expect: { owner: 200, engineer: 200, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'edit hardpoints',
    method: 'put',
    path: () => `${design()}/corner`,
    body: async () => ({ corner: exampleCorners.fsFrontWishbone, baseRevision: await currentRevision(design()) }),
    expect: { owner: 403, engineer: 403, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'import hardpoints (preview, nothing saved)',
    method: 'post',
    path: () => `${design()}/import`,
    upload: () => ({ name: 'points.csv', text: `point,x,y,z\ntieRodInner,${exampleCorners.fsFrontWishbone.points.tieRodInner.join(',')}\n` }),
    expect: { owner: 403, engineer: 403, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'axle design revisions', method: 'get', path: () => `${design()}/revisions`, expect: READ },
  { name: 'compare axle design revisions', method: 'get', path: () => `${design()}/compare?from=1&to=1`, expect: READ },
  {
    name: 'propose geometry',
    method: 'post',
    path: () => `${design()}/proposals`,
    body: async () => ({ corner: exampleCorners.fsFrontWishbone, baseRevision: await currentRevision(design()) }),
    expect: { owner: 403, engineer: 201, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'list proposals', method: 'get', path: () => `${design()}/proposals`, expect: READ },
  {
    name: 'accept a proposal',
    method: 'post',
    before: newProposal,
    path: () => `${design()}/proposals/${proposalId}/accept`,
    body: () => ({}),
    expect: { owner: 403, engineer: 403, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'reject a proposal',
    method: 'post',
    before: newProposal,
    path: () => `${design()}/proposals/${proposalId}/reject`,
    body: () => ({ message: 'not this one' }),
    expect: { owner: 403, engineer: 403, designer: 200, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'withdraw own proposal',
    method: 'delete',
    before: newProposal,
    path: () => `${design()}/proposals/${proposalId}`,
    expect: { owner: 403, engineer: 200, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'list invitations',
    method: 'get',
    path: () => `${team()}/invitations`,
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'invite by e-mail',
    method: 'post',
    path: () => `${team()}/invitations`,
    body: () => ({ email: `invitee-${Date.now()}-${Math.random().toString(36).slice(2)}@test.example`, roles: ['viewer'] }),
    expect: { owner: 201, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    // One's own inbox, not a team's: every signed-in person, nobody else.
    name: 'own captured mail (development only)',
    method: 'get',
    path: () => '/api/dev/mail',
    expect: { owner: 200, engineer: 200, designer: 200, reviewer: 200, viewer: 200, nonMember: 200, anonymous: 401 },
  },
  { name: 'team activity', method: 'get', path: () => `${team()}/activity`, expect: READ },
  { name: 'team activity as CSV', method: 'get', path: () => `${team()}/activity?format=csv`, expect: READ },
  { name: 'axle design activity', method: 'get', path: () => `${design()}/activity`, expect: READ },
  {
    name: 'programme invitations of the team',
    method: 'get',
    before: newProgramme,
    path: () => `${team()}/programmes`,
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'decline a programme',
    method: 'post',
    path: () => `${team()}/programmes/${programmeId}/decline`,
    body: () => ({}),
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'accept a programme',
    method: 'post',
    path: () => `${team()}/programmes/${programmeId}/accept`,
    body: () => ({}),
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'list configurations', method: 'get', path: () => `${team()}/configurations`, expect: READ },
  {
    name: 'create configuration',
    method: 'post',
    path: () => `${team()}/configurations`,
    body: () => configurationBody('Matrix configuration'),
    expect: { owner: 201, engineer: 201, designer: 201, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'read configuration', method: 'get', before: () => freshConfiguration('draft'), path: configuration, expect: READ },
  {
    name: 'revise configuration',
    method: 'put',
    path: configuration,
    body: async () => ({ baseRevision: await currentRevision(configuration()), trackProfile: 'bumpy-circuit' }),
    expect: MANAGE,
  },
  { name: 'archive configuration', method: 'patch', path: configuration, body: () => ({ archived: false }), expect: MANAGE },
  { name: 'configuration revisions', method: 'get', path: () => `${configuration()}/revisions`, expect: READ },
  { name: 'configuration history', method: 'get', path: () => `${configuration()}/history`, expect: READ },
  { name: 'configuration results', method: 'get', path: () => `${configuration()}/results`, expect: READ },
  { name: 'compare configurations', method: 'get', path: () => `${team()}/configurations/compare?a=${configurationId}&b=${configurationId}`, expect: READ },
  { name: 'submit for review', method: 'post', beforeEach: () => freshConfiguration('draft'), path: () => `${configuration()}/submit`, body: () => ({}), expect: REVIEW_SUBMIT },
  { name: 'withdraw from review', method: 'post', beforeEach: () => freshConfiguration('in_review'), path: () => `${configuration()}/withdraw`, body: () => ({}), expect: REVIEW_SUBMIT },
  { name: 'approve (sign off)', method: 'post', beforeEach: () => freshConfiguration('in_review'), path: () => `${configuration()}/approve`, body: signOffBody, expect: REVIEW_DECIDE },
  {
    name: 'request changes',
    method: 'post',
    beforeEach: () => freshConfiguration('in_review'),
    path: () => `${configuration()}/request-changes`,
    body: () => ({ message: 'more rear roll steer' }),
    expect: REVIEW_DECIDE,
  },
  { name: 'release', method: 'post', beforeEach: () => freshConfiguration('approved'), path: () => `${configuration()}/release`, body: () => ({}), expect: REVIEW_DECIDE },
  { name: 'validate', method: 'post', beforeEach: () => freshConfiguration('released'), path: () => `${configuration()}/validate`, body: () => WAIVERS, expect: REVIEW_DECIDE },
  { name: 'sign-off gates', method: 'get', path: () => `${configuration()}/gates`, expect: READ },
  { name: 'latest revisions preview', method: 'get', path: () => `${configuration()}/latest-preview`, expect: READ },
  { name: 'review record', method: 'get', path: () => `${configuration()}/record`, expect: READ },
  { name: 'list approvals', method: 'get', before: () => freshConfiguration('approved'), path: () => `${configuration()}/approvals`, expect: READ },
  { name: 'read approval with recompute', method: 'get', path: () => `${configuration()}/approvals/${approvalId}`, expect: READ },
  { name: 'list comments', method: 'get', path: () => `${configuration()}/comments`, expect: READ },
  {
    name: 'comment',
    method: 'post',
    path: () => `${configuration()}/comments`,
    body: () => ({ body: 'Budget: rear roll steer term', resultRef: 'budget' }),
    expect: { owner: 201, engineer: 201, designer: 201, reviewer: 201, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'resolve a thread',
    method: 'post',
    before: newComment,
    path: () => `${configuration()}/comments/${commentId}/resolve`,
    body: () => ({}),
    expect: { owner: 200, engineer: 200, designer: 200, reviewer: 200, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  {
    name: 'reopen a thread',
    method: 'post',
    path: () => `${configuration()}/comments/${commentId}/reopen`,
    body: () => ({}),
    expect: { owner: 200, engineer: 200, designer: 200, reviewer: 200, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'list rig measurements', method: 'get', path: () => `${team()}/rig-measurements`, expect: READ },
  {
    name: 'preview a rig file (nothing stored)',
    method: 'post',
    path: () => `${team()}/rig-measurements/preview`,
    upload: () => rigFile(),
    expect: MANAGE,
  },
  {
    name: 'store a rig measurement',
    method: 'post',
    path: () => `${team()}/rig-measurements`,
    upload: () => rigFile(),
    fields: () => ({ mapping: JSON.stringify(RIG_MAPPING), target: JSON.stringify({ kind: 'baseline', designId }) }),
    expect: { owner: 201, engineer: 201, designer: 201, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'read a rig measurement with its comparison', method: 'get', before: newRigMeasurement, path: () => `${team()}/rig-measurements/${rigMeasurementId}`, expect: READ },
  {
    name: 'delete a rig measurement',
    method: 'delete',
    beforeEach: newRigMeasurement,
    path: () => `${team()}/rig-measurements/${rigMeasurementId}`,
    expect: { owner: 204, engineer: 204, designer: 204, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
  { name: 'read the rig tolerance', method: 'get', path: () => `${team()}/rig-tolerance`, expect: READ },
  {
    name: 'set the rig tolerance',
    method: 'put',
    path: () => `${team()}/rig-tolerance`,
    body: () => ({ toeDeg: 0.1, camberDeg: 0.25 }),
    expect: { owner: 200, engineer: 403, designer: 403, reviewer: 403, viewer: 403, nonMember: 404, anonymous: 401 },
  },
];


async function configurationBody(name: string) {
  const designs = (await agents.owner.get(`${vehicle()}/axle-designs`).expect(200)).body as { id: string; axle: string; name: string }[];
  return {
    name,
    vehicleId,
    frontDesignId: designId,
    rearDesignId: designs.find((d) => d.name === 'Rear baseline')!.id,
    trackProfile: 'smooth-circuit',
  };
}

/** A sign-off body with a written reason for each Critical caution the gate names (the gates themselves: review-gates.test.ts). */
async function signOffBody(): Promise<object> {
  const critical = (await agents.owner.get(`${configuration()}/gates`).expect(200)).body.critical as { axle: string; code: string }[];
  return { acknowledgements: critical.map((c) => ({ axle: c.axle, code: c.code, reason: 'accepted for the permission matrix' })) };
}
/** Waivers of the rig evidence for both axles (no rig data in this fixture). */
const WAIVERS = { waivers: [{ axle: 'front', reason: 'no rig data in this fixture' }, { axle: 'rear', reason: 'no rig data in this fixture' }] };

/** A new configuration (by the owner, who decides nothing) brought to `state` by the engineer and the reviewer. */
async function freshConfiguration(state: 'draft' | 'in_review' | 'approved' | 'released'): Promise<void> {
  const c = await agents.owner.post(`${team()}/configurations`).send(await configurationBody(`Matrix ${state}`));
  expect(c.status, JSON.stringify(c.body)).toBe(201);
  configurationId = c.body.id;
  const steps = { draft: [], in_review: ['submit'], approved: ['submit', 'approve'], released: ['submit', 'approve', 'release'] }[state];
  for (const step of steps) {
    const who = step === 'submit' ? agents.engineer : agents.reviewer;
    const r = await who.post(`${configuration()}/${step}`).send(step === 'approve' ? await signOffBody() : {});
    expect(r.status, `${step}: ${JSON.stringify(r.body)}`).toBe(200);
  }
  if (state !== 'draft' && state !== 'in_review') {
    approvalId = (await agents.owner.get(`${configuration()}/approvals`).expect(200)).body[0].id;
  }
}

let programmeId = '';
async function newProgramme(): Promise<void> {
  const iris = await signIn(t.app, instructorEmail);
  const p = await iris.post('/api/programmes').send({ name: 'Matrix programme', trackProfile: 'smooth-circuit' });
  expect(p.status, JSON.stringify(p.body)).toBe(201);
  programmeId = p.body.id;
  await iris.post(`/api/programmes/${programmeId}/teams`).send({ teamSlug: 'tallowmere' }).expect(201);
}

async function newComment(): Promise<void> {
  const r = await agents.reviewer.post(`${configuration()}/comments`).send({ body: 'Thread to resolve' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  commentId = r.body.id;
}

const RIG_MAPPING = { hasHeader: true, travelColumn: 0, toeColumn: 1, travelUnit: 'mm', toeUnit: 'deg', travelSign: 'bump-positive', toeSign: 'toe-in-positive' };
const rigFile = () => ({ name: 'rig.csv', text: 'travel (mm),toe (deg)\n-20,0.01\n0,0\n20,0.012\n' });
let rigMeasurementId = '';
/** A stored rig measurement (by the designer) for the read and delete rows. */
async function newRigMeasurement(): Promise<void> {
  const f = rigFile();
  const r = await agents.designer
    .post(`${team()}/rig-measurements`)
    .field('mapping', JSON.stringify(RIG_MAPPING))
    .field('target', JSON.stringify({ kind: 'baseline', designId }))
    .attach('file', Buffer.from(f.text, 'utf8'), { filename: f.name, contentType: 'text/csv' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  rigMeasurementId = r.body.id;
}

let proposalId = '';
async function newProposal(): Promise<void> {
  const r = await agents.engineer.post(`${design()}/proposals`).send({ corner: exampleCorners.fsFrontWishbone, baseRevision: await currentRevision(design()) });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  proposalId = r.body.id;
}

describe('role × route matrix (Tallowmere; non-member is a Brackenfield reviewer)', () => {
  for (const row of ROWS) {
    it(`${row.method.toUpperCase()} ${row.name}`, async () => {
      const got: Partial<Record<Who, number>> = {};
      await row.before?.();
      for (const w of WHO) {
        await row.beforeEach?.();
        let req = agents[w][row.method](row.path());
        if (row.body) req = req.send((await row.body()) as object);
        for (const [k, v] of Object.entries(row.fields?.() ?? {})) req = req.field(k, v);
        if (row.upload) {
          const file = row.upload();
          req = req.attach('file', Buffer.from(file.text, 'utf8'), { filename: file.name, contentType: 'text/csv' });
        }
        const r = await req;
        got[w] = r.status;
        if (r.status >= 400) expect(r.body.error.code, `${w}: ${JSON.stringify(r.body)}`).toBe({ 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found' }[r.status]);
      }
      expect(got).toEqual(row.expect);
    });
  }

  it('a user with several roles holds the union of their permissions (Bo: owner + engineer + designer)', async () => {
    const bo = await signIn(t.app, 'owner@brackenfield.example');
    const teams = await bo.get('/api/teams').expect(200);
    const b = teams.body.find((x: { slug: string }) => x.slug === 'brackenfield');
    const detail = await bo.get(`/api/teams/${b.id}`).expect(200);
    expect(detail.body.roles).toEqual(['owner', 'engineer', 'designer']);
    expect([...detail.body.permissions].sort()).toEqual(
      ['team:read', 'members:manage', 'vehicle:manage', 'vehicle:edit', 'design:propose', 'design:edit', 'design:accept', 'review:submit', 'review:comment', 'study:run'].sort(),
    );
  });

  it('GET team reports the caller’s own permissions per role', async () => {
    const expected: Record<string, string[]> = {
      owner: ['team:read', 'members:manage', 'vehicle:manage', 'review:comment'],
      engineer: ['team:read', 'vehicle:manage', 'vehicle:edit', 'design:propose', 'review:submit', 'review:comment', 'study:run'],
      designer: ['team:read', 'vehicle:manage', 'design:edit', 'design:accept', 'review:submit', 'review:comment', 'study:run'],
      reviewer: ['team:read', 'review:decide', 'review:comment'],
      viewer: ['team:read'],
    };
    for (const [role, perms] of Object.entries(expected)) {
      const r = await agents[role as Who].get(team()).expect(200);
      expect([...r.body.permissions].sort(), role).toEqual([...perms].sort());
      // And the server's own matrix agrees with what is written here.
      expect([...ROLE_PERMISSIONS[role as keyof typeof ROLE_PERMISSIONS]].sort()).toEqual([...perms].sort());
    }
  });

  it('a malformed team id is a plain 404', async () => {
    const r = await agents.owner.get('/api/teams/not-a-uuid/vehicles');
    expect(r.status).toBe(404);
    expect((await request(t.app).get('/api/teams/not-a-uuid')).status).toBe(401);
  });
});
