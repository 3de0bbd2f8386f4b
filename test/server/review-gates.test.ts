/**
 * The sign-off gates on a real PostgreSQL: a sign-off is refused while any
 * Critical caution lacks a written reason and accepted when each has one (the
 * reasons kept with the transition); "validated" is refused without rig
 * evidence within the team's tolerance or a recorded waiver; the "use the
 * latest revisions" preview shows what changes and saves nothing; the review
 * record holds both axles, the acknowledgements, waivers and the snapshot
 * fingerprint, as JSON, a printable page and a PDF.
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { sweepCorner } from '../../shared/kinematics/sweep.js';
import { expectError, idOf, signIn, startTestApp, type Agent, type TestApp } from './helpers.js';

let t: TestApp;
let designer: Agent, engineer: Agent, reviewer: Agent, viewer: Agent;
let teamId = '';
let vehicleId = '';
let frontId = '';
let rearId = '';
/** A rear design whose toe link's inner end sits 6 mm lower: rear roll oversteer past the Critical default (cautions.md). */
let oversteerRearId = '';

const team = () => `/api/teams/${teamId}`;
const cfg = (id: string) => `${team()}/configurations/${id}`;
const REASON = 'Rear roll oversteer is the balance we set for the skid pad; stability checked in the step-steer run';

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  designer = await signIn(t.app, 'designer@tallowmere.example');
  engineer = await signIn(t.app, 'engineer@tallowmere.example');
  reviewer = await signIn(t.app, 'reviewer@tallowmere.example');
  viewer = await signIn(t.app, 'viewer@tallowmere.example');
  teamId = await idOf(viewer, '/api/teams', 'tallowmere');
  vehicleId = await idOf(viewer, `${team()}/vehicles`, 'TUR-26 Ember');
  const designs = (await viewer.get(`${team()}/vehicles/${vehicleId}/axle-designs`).expect(200)).body as { id: string; name: string }[];
  frontId = designs.find((d) => d.name === 'Front baseline')!.id;
  rearId = designs.find((d) => d.name === 'Rear baseline')!.id;
  const lowered = structuredClone(exampleCorners.fsRearWishbone);
  lowered.points.tieRodInner = [lowered.points.tieRodInner[0], lowered.points.tieRodInner[1], lowered.points.tieRodInner[2] - 6];
  oversteerRearId = (await designer.post(`${team()}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'rear', name: 'Rear, toe link inner −6 mm', corner: lowered }).expect(201)).body.id;
});
afterAll(async () => {
  await t?.close();
});

async function configurationIn(state: 'in_review' | 'released', name: string, rear = rearId): Promise<string> {
  const r = await designer.post(`${team()}/configurations`).send({ name, vehicleId, frontDesignId: frontId, rearDesignId: rear, trackProfile: 'smooth-circuit' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  const id = r.body.id as string;
  await designer.post(`${cfg(id)}/submit`).send({}).expect(200);
  if (state === 'released') {
    await signOff(id).expect(200);
    await reviewer.post(`${cfg(id)}/release`).send({}).expect(200);
  }
  return id;
}

type Critical = { axle: 'front' | 'rear'; code: string; message: string };
async function critical(id: string): Promise<Critical[]> {
  return (await viewer.get(`${cfg(id)}/gates`).expect(200)).body.critical as Critical[];
}
async function signOffBody(id: string) {
  return { acknowledgements: (await critical(id)).map((c) => ({ axle: c.axle, code: c.code, reason: REASON })) };
}
function signOff(id: string) {
  return {
    expect: async (status: number) => {
      const r = await reviewer.post(`${cfg(id)}/approve`).send(await signOffBody(id));
      expect(r.status, JSON.stringify(r.body)).toBe(status);
      return r;
    },
  };
}

/** A rig file written from the engine's own sweep of a corner: it agrees with the prediction exactly (rig-measurements.md). `slopeDegPerMm` tilts the toe to make it disagree. */
function rigFile(corner: typeof exampleCorners.fsFrontWishbone, slopeDegPerMm = 0): string {
  const s = sweepCorner(corner, { travel: { from: -25, to: 25, step: 5 } });
  return ['Wheel travel (mm),Toe (deg)', ...s.rows.map((r) => `${r.travelMm},${r.toeDeg + slopeDegPerMm * r.travelMm}`)].join('\n') + '\n';
}
const MAPPING = { hasHeader: true, travelColumn: 0, toeColumn: 1, camberColumn: null, travelUnit: 'mm', toeUnit: 'deg', travelSign: 'bump-positive', toeSign: 'toe-in-positive' };
function uploadRig(id: string, axle: 'front' | 'rear', text: string) {
  return designer
    .post(`${team()}/rig-measurements`)
    .field('mapping', JSON.stringify(MAPPING))
    .field('target', JSON.stringify({ kind: 'configuration', configurationId: id, axle }))
    .field('options', JSON.stringify({ name: `${axle} rig run` }))
    .attach('file', Buffer.from(text, 'utf8'), { filename: `${axle}.csv`, contentType: 'text/csv' });
}

describe('sign-off gate: Critical cautions', () => {
  it('refuses a sign-off while any Critical caution lacks a written reason, and accepts it when each has one', async () => {
    const id = await configurationIn('in_review', 'Gate: cautions', oversteerRearId);
    const list = await critical(id);
    // The lowered rear toe link steers the rear axle out of the turn as the body rolls (common practice: rear roll
    // oversteer lowers stability as cornering builds), past the Critical default; the configuration screen shows the same list.
    expect(list.map((c) => `${c.axle}:${c.code}`)).toContain('rear:rear-roll-oversteer');
    for (const c of list) expect(c.message.length).toBeGreaterThan(10);

    const none = await reviewer.post(`${cfg(id)}/approve`).send({});
    expectError(none, 409, 'cautions_unacknowledged');
    expect(none.body.error.message).toContain('written reason for every Critical caution');
    expect(none.body.error.details.unacknowledged.map((c: Critical) => `${c.axle}:${c.code}`).sort()).toEqual(list.map((c) => `${c.axle}:${c.code}`).sort());

    if (list.length > 1) {
      const some = await reviewer.post(`${cfg(id)}/approve`).send({ acknowledgements: [{ axle: list[0]!.axle, code: list[0]!.code, reason: REASON }] });
      expectError(some, 409, 'cautions_unacknowledged');
      expect(some.body.error.details.unacknowledged).toHaveLength(list.length - 1);
    }
    // A reason is required, and an acknowledgement must match a Critical caution of this revision.
    const blank = await reviewer.post(`${cfg(id)}/approve`).send({ acknowledgements: list.map((c) => ({ axle: c.axle, code: c.code, reason: '  ' })) });
    expectError(blank, 400, 'invalid_input');
    const stray = await reviewer.post(`${cfg(id)}/approve`).send({ acknowledgements: [...(await signOffBody(id)).acknowledgements, { axle: 'rear', code: 'safety-notice', reason: REASON }] });
    expectError(stray, 400, 'invalid_input');
    // Nothing moved, nothing frozen.
    expect((await viewer.get(cfg(id)).expect(200)).body.status).toBe('in_review');
    expect((await viewer.get(`${cfg(id)}/approvals`).expect(200)).body).toEqual([]);

    const ok = await reviewer.post(`${cfg(id)}/approve`).send({ ...(await signOffBody(id)), message: 'Signed off with the rear roll oversteer noted' });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.status).toBe('approved');
    const gates = (await viewer.get(`${cfg(id)}/gates`).expect(200)).body;
    expect(gates.acknowledgements).toHaveLength(list.length);
    for (const a of gates.acknowledgements) {
      expect(a).toMatchObject({ revision: 1, reason: REASON, acknowledgedByName: 'Ravi Osei' });
      expect(list.find((c) => c.axle === a.axle && c.code === a.code)!.message).toBe(a.message);
    }
  });

  it('a read-only member sees the gates but cannot sign off', async () => {
    const id = await configurationIn('in_review', 'Gate: viewer');
    expectError(await viewer.post(`${cfg(id)}/approve`).send(await signOffBody(id)), 403, 'forbidden');
  });
});

describe('validated gate: rig evidence or a waiver', () => {
  it('refuses validated without rig evidence or a waiver for each axle, and records waivers with their reasons', async () => {
    const id = await configurationIn('released', 'Gate: waiver');
    const none = await reviewer.post(`${cfg(id)}/validate`).send({});
    expectError(none, 409, 'rig_evidence_missing');
    expect(none.body.error.message).toContain('front axle');
    expect(none.body.error.message).toContain('rear axle');
    const half = await reviewer.post(`${cfg(id)}/validate`).send({ waivers: [{ axle: 'front', reason: 'Front corner carried over unchanged from the rig-checked 2025 car' }] });
    expectError(half, 409, 'rig_evidence_missing');
    expect(half.body.error.details.axles.map((a: { axle: string }) => a.axle)).toEqual(['rear']);
    expectError(await reviewer.post(`${cfg(id)}/validate`).send({ waivers: [{ axle: 'front', reason: '' }, { axle: 'rear', reason: 'x' }] }), 400, 'invalid_input');
    expect((await viewer.get(cfg(id)).expect(200)).body.status).toBe('released');

    const waivers = [
      { axle: 'front', reason: 'Front corner carried over unchanged from the rig-checked 2025 car' },
      { axle: 'rear', reason: 'Rig out of service; track test on 14 March showed the expected balance' },
    ];
    const ok = await reviewer.post(`${cfg(id)}/validate`).send({ waivers });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body.status).toBe('validated');
    const record = (await viewer.get(`${cfg(id)}/record`).expect(200)).body;
    expect(record.waivers.map((w: { axle: string; reason: string; waivedByName: string }) => [w.axle, w.reason, w.waivedByName])).toEqual(waivers.map((w) => [w.axle, w.reason, 'Ravi Osei']));
  });

  it('a rig measurement within the team tolerance stands as evidence; one outside it does not', async () => {
    const id = await configurationIn('released', 'Gate: rig');
    // Rear: 0.01 deg/mm extra toe slope, 0.25° at 25 mm, beyond the default 0.1° toe tolerance (rig-measurements.md).
    const rearOff = await uploadRig(id, 'rear', rigFile(exampleCorners.fsRearWishbone, 0.01));
    expect(rearOff.status, JSON.stringify(rearOff.body)).toBe(201);
    const front = await uploadRig(id, 'front', rigFile(exampleCorners.fsFrontWishbone));
    expect(front.status, JSON.stringify(front.body)).toBe(201);
    const gates = (await viewer.get(`${cfg(id)}/gates`).expect(200)).body;
    const axle = (a: string) => gates.rig.axles.find((x: { axle: string }) => x.axle === a);
    expect(axle('front')).toMatchObject({ satisfied: true });
    expect(axle('front').measurements[0].toeLargestDeg).toBeCloseTo(0, 9);
    expect(axle('rear')).toMatchObject({ satisfied: false });
    expect(Math.abs(axle('rear').measurements[0].toeLargestDeg)).toBeCloseTo(0.25, 6);

    const refused = await reviewer.post(`${cfg(id)}/validate`).send({});
    expectError(refused, 409, 'rig_evidence_missing');
    expect(refused.body.error.details.axles.map((a: { axle: string }) => a.axle)).toEqual(['rear']);
    const ok = await reviewer.post(`${cfg(id)}/validate`).send({ waivers: [{ axle: 'rear', reason: 'Rig fixture bent on the rear run; re-measure booked' }] });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
  });
});

describe('use the latest revisions: preview', () => {
  it('shows the changed inputs and key results old → new and saves nothing', async () => {
    const r = await designer.post(`${team()}/configurations`).send({ name: 'Preview', vehicleId, frontDesignId: frontId, rearDesignId: rearId, trackProfile: 'smooth-circuit' });
    expect(r.status).toBe(201);
    const id = r.body.id as string;
    const upToDate = (await viewer.get(`${cfg(id)}/latest-preview`).expect(200)).body;
    expect(upToDate).toMatchObject({ upToDate: true, changedRefs: [], inputs: [], results: [] });

    // The designer raises the rear toe link's inner point 4 mm: a new rear design revision.
    const design = (await viewer.get(`${team()}/axle-designs/${rearId}`).expect(200)).body;
    const corner = structuredClone(design.corner);
    const before = corner.points.tieRodInner[2] as number;
    corner.points.tieRodInner[2] = before + 4;
    await designer.put(`${team()}/axle-designs/${rearId}/corner`).send({ corner, baseRevision: design.revision, message: 'toe link inner +4 mm' }).expect(200);

    const p = (await viewer.get(`${cfg(id)}/latest-preview`).expect(200)).body;
    expect(p.upToDate).toBe(false);
    expect(p.changedRefs).toEqual([{ ref: 'rearDesignRevision', from: design.revision, to: design.revision + 1 }]);
    const moved = p.inputs.find((d: { path: string }) => d.path === 'rearCorner.points.tieRodInner[2]');
    expect(moved).toMatchObject({ a: before, b: before + 4 });
    expect(moved.change).toBeCloseTo(4, 12);
    // A toe-link height change changes the rear roll steer (common practice: that is what the link height sets).
    expect(p.results.map((d: { path: string }) => d.path)).toContain('balance.kinematicsLink.rear.used.rollSteerCoefficient');
    // Nothing saved: still revision 1 on the old rear revision.
    const after = (await viewer.get(cfg(id)).expect(200)).body;
    expect(after).toMatchObject({ revision: 1, rear: { revision: design.revision } });
    // Saving is the ordinary new revision with the previewed revisions.
    const saved = await designer.put(cfg(id)).send({ baseRevision: 1, rearDesignId: rearId, rearDesignRevision: p.latest.rearDesignRevision, message: 'latest revisions' });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect(saved.body.rear.revision).toBe(design.revision + 1);
  });
});

/** Sorted-key JSON, written here independently of the server's. */
function sortedJson(v: unknown): string {
  if (v === null || typeof v !== 'object') return JSON.stringify(v);
  if (Array.isArray(v)) return `[${v.map(sortedJson).join(',')}]`;
  return `{${Object.keys(v)
    .sort()
    .map((k) => `${JSON.stringify(k)}:${sortedJson((v as Record<string, unknown>)[k])}`)
    .join(',')}}`;
}

describe('configuration review record', () => {
  it('holds both axles, the acknowledgements and the approval snapshot fingerprint, as JSON, a page and a PDF', async () => {
    const id = await configurationIn('in_review', 'Record', oversteerRearId);
    await signOff(id).expect(200);
    const rec = (await viewer.get(`${cfg(id)}/record`).expect(200)).body;
    expect(rec.configuration).toMatchObject({ id, name: 'Record', status: 'approved' });
    expect(rec.curves.front).toHaveLength(41);
    expect(rec.curves.rear).toHaveLength(41);
    expect(rec.cautions.map((c: { axle: string }) => c.axle)).toEqual(['front', 'rear']);
    expect(rec.acknowledgements.length).toBeGreaterThan(0);
    expect(rec.history.map((h: { toStatus: string }) => h.toStatus)).toEqual(['in_review', 'approved']);
    expect(rec.safetyNotice).toContain('Verify on a kinematics rig');

    const approvals = (await viewer.get(`${cfg(id)}/approvals`).expect(200)).body;
    const snap = (await viewer.get(`${cfg(id)}/approvals/${approvals[0].id}`).expect(200)).body;
    const expected = createHash('sha256')
      .update(sortedJson({ configurationId: id, revision: snap.revision, engineVersion: snap.engineVersion, inputs: snap.inputs, results: snap.results }))
      .digest('hex');
    expect(rec.approval.fingerprint).toBe(expected);

    const page = await viewer.get(`${cfg(id)}/record.html`).expect(200);
    expect(page.headers['content-type']).toContain('text/html');
    expect(page.headers['content-security-policy']).toContain("default-src 'none'");
    expect(page.text).toContain(expected);
    expect(page.text).toContain(REASON);
    expect(page.text).toContain('Verify on a kinematics rig');
    // The viewer's account is SI: the record says so (issue 15 §2).
    expect(page.text).toContain('<dd data-units="si">SI (mm, kg, N, km/h; angles in deg)');
    expect(page.text).not.toContain('<script');

    const pdf = await viewer
      .get(`${cfg(id)}/record.pdf`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(pdf.headers['content-disposition']).toContain('review-record-Record-r1.pdf');
    const bytes = pdf.body as Buffer;
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(bytes.length).toBeGreaterThan(10_000);
  });

  it('lists each corner\'s steering, what its parts ride on and every compliance rate in words, "rigid" where none is given, in the reader\'s units', async () => {
    // A rear design with one compliant bushing and a toe-link rate (invented values); every other mount is rigid.
    const compliant = { ...structuredClone(exampleCorners.fsRearWishbone), bushings: { lowerFront: { radialNPerMm: 1751.2683524647638, axialNPerMm: 875.6341762323819 } }, linkAxialNPerMm: { tieRod: 8756.341762323819 } };
    const rear = (await designer.post(`${team()}/vehicles/${vehicleId}/axle-designs`).send({ axle: 'rear', name: 'Rear, compliant front pivot', corner: compliant }).expect(201)).body.id as string;
    const id = await configurationIn('in_review', 'Record with compliance', rear);
    const rec = (await viewer.get(`${cfg(id)}/record`).expect(200)).body;
    const page = (await viewer.get(`${cfg(id)}/record.html`).query({ units: 'imperial' }).expect(200)).text;
    const table = (title: string) => {
      const at = page.indexOf(`<caption>${title}</caption>`);
      expect(at, title).toBeGreaterThan(0);
      const html = page.slice(at, page.indexOf('</table>', at));
      return Object.fromEntries([...html.matchAll(/<th scope="row">([^<]+)<\/th><td class="num">([^<]*)<\/td><td>([^<]*)<\/td>/g)].map((m) => [m[1], `${m[2]} | ${m[3]}`]));
    };
    const back = table('Rear corner: steering, attachments and compliance');
    expect(back['Steered']).toBe('no: a fixed toe link | ');
    // 1751.27 N/mm is 10 000 lbf/in, 875.634 N/mm 5000 lbf/in (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm; NIST SP 811).
    expect(back['Bushing, Lower arm, front pivot (radial, axial)']).toBe('10000, 5000 | lbf/in');
    expect(back['Bushing, Lower arm, rear pivot (radial, axial)']).toBe('rigid | ');
    expect(back['Link rate, Toe link, axial']).toBe('50000 | lbf/in');
    expect(back['Spring, suspension end rides on']).toBe(`${rec.inputs.rearCorner.spring.springOuterOn === 'lowerArm' ? 'lower arm' : 'upright'} | `);
    expect(Object.keys(back).filter((k) => k.startsWith('Steering rate'))).toEqual([]);
    const front = table('Front corner: steering, attachments and compliance');
    expect(front['Steered']).toBe('yes | ');
    expect(front['Steered by']).toBe('steering rack | ');
    const [lo, hi] = rec.inputs.frontCorner.steering.rackStroke as [number, number];
    const inches = (mm: number) => String(Number((mm / 25.4).toPrecision(6))).replace('-', '−');
    expect(front['Rack stroke (toward the right, toward the left)']).toBe(`${inches(lo)}, ${inches(hi)} | in`);
    // The demo front corner gives no steering rate: rigid.
    expect(rec.inputs.frontCorner.steeringStiffnessNPerMm).toBeUndefined();
    expect(front['Steering rate, steering at the rack, along its travel']).toBe('rigid | ');
    // The plain list no longer repeats these keys in document words.
    const plain = page.slice(page.indexOf('<caption>Rear corner</caption>'), page.indexOf('<caption>Rear corner: steering'));
    expect(plain).not.toMatch(/<th scope="row">(steered|bushings · |spring outer on|link axial)/);
  });

  it("follows the reader's unit choice: ?units=imperial, else the account setting; hardpoints converted at 25.4 mm per inch (NIST SP 811)", async () => {
    const id = await configurationIn('in_review', 'Record in inches');
    const rec = (await viewer.get(`${cfg(id)}/record`).expect(200)).body;
    const upperOuterMm = rec.inputs.frontCorner.points.upperOuter as [number, number, number];
    const page = (await viewer.get(`${cfg(id)}/record.html`).query({ units: 'imperial' }).expect(200)).text;
    expect(page).toContain('<dd data-units="imperial">Inch-pound');
    expect(page).toContain('Wheel travel, in (bump +)');
    expect(page).toContain('Bump steer, deg/in');
    // Hardpoints to 0.1 mm in SI are written to 0.01 in (the same resolution); 1 in = 25.4 mm exactly (NIST SP 811, Appendix B).
    // The point is named as the hardpoint table names it (issue 15 §1: no words made from internal keys).
    const row = /<th scope="row">Upper ball joint<\/th><td class="num">([^<]+)<\/td><td>in \(x, y, z\)<\/td>/.exec(page);
    expect(row, 'the upper ball joint in inches').not.toBeNull();
    const inputs = page.slice(page.indexOf('8. Inputs'));
    expect(inputs).toContain('<th scope="row">Tie rod, inner end (rack)</th>');
    expect(inputs).not.toMatch(/<th scope="row">(upper outer|tie rod inner|lower front)<\/th>/);
    const inches = row![1]!.split(', ').map((v) => Number(v.replace('−', '-')));
    inches.forEach((v, i) => expect(Math.abs(v - upperOuterMm[i]! / 25.4)).toBeLessThanOrEqual(0.005));
    // Inputs whose unit is not in their key: the wheel radius in inches, the tyre load sensitivity b per lbf
    // (1 lbf = 4.4482216152605 N, NIST SP 811), and an axis direction as plain numbers, never converted as a length.
    const inputRow = (label: string) => new RegExp(`<th scope="row">${label}</th><td class="num">([^<]+)</td><td>([^<]*)</td>`).exec(inputs);
    const radius = inputRow('wheel · radius');
    expect(radius?.[2]).toBe('in');
    expect(Math.abs(Number(radius![1]) - rec.inputs.frontCorner.wheel.radius / 25.4)).toBeLessThanOrEqual(5e-4);
    const b = inputRow('front · tyre · load sensitivity · b');
    expect(b?.[2]).toBe('1/(deg·lbf)');
    expect(Number(b![1]) / (rec.inputs.vehicle.front.tyre.loadSensitivity.b * 4.4482216152605)).toBeCloseTo(1, 5);
    const axis = inputRow('Rack axis direction \\(x, y, z\\)');
    expect(axis?.[1]).toBe((rec.inputs.frontCorner.steering.rackAxis as number[]).map((x) => String(x).replace('-', '−')).join(', '));
    expect(axis?.[2]).toBe('');
    // Caution figures in the reader's units: no millimetre figure left in the cautions section.
    const cautions = page.slice(page.indexOf('3. Bump cost and cautions'), page.indexOf('4. Critical cautions'));
    expect(cautions).not.toMatch(/\d mm\b|<td class="num">[^<]* mm<\/td>/);

    await viewer.patch('/api/auth/me').send({ displayUnits: 'imperial' }).expect(200);
    try {
      expect((await viewer.get(`${cfg(id)}/record.html`).expect(200)).text).toContain('data-units="imperial"');
      expect((await viewer.get(`${cfg(id)}/record.html`).query({ units: 'si' }).expect(200)).text).toContain('data-units="si"');
    } finally {
      await viewer.patch('/api/auth/me').send({ displayUnits: 'si' }).expect(200);
    }
    const bad = await viewer.get(`${cfg(id)}/record.html`).query({ units: 'cubits' });
    expectError(bad, 400, 'invalid_input');
    expect(JSON.stringify(bad.body)).toContain('units');
  });
});
