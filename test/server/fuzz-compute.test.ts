/**
 * Fuzzing the compute doors (issue 8, part 1): seeded fast-check bodies,
 * mutations of valid requests, against the in-process app with a signed-in
 * agent. Each body must get either 200 with a result free of NaN/Infinity
 * (checked on the engine's raw result too, as JSON turns them into null), or a 4xx whose message names a field (400) or the travel / rack /
 * link / time limit (422); never a 5xx. A health request between batches must
 * answer fast (solves run in the worker pool, off the event loop).
 *
 * Replay a failure: the seed is printed at the start; FUZZ_SEED=<seed> reruns
 * exactly the same bodies (fast-check also prints seed and path on failure).
 */
import type { Server } from 'node:http';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import request from 'supertest';
import { exampleCorners } from '../../shared/kinematics/examples.js';
import { exampleVehicles } from '../../shared/balance/examples.js';
import { intentSchema } from '../../shared/schema/intent.js';
import { parseOrThrow } from '../../shared/errors.js';
import { computeAxleRoll, computeCornerSweep } from '../../shared/kinematics/api.js';
import { computeBalance } from '../../shared/balance/api.js';
import { solveIntent } from '../../shared/intent/solve.js';
import { startTestApp, type TestApp } from './helpers.js';

// A fixed default keeps CI repeatable; FUZZ_SEED=<n> explores (or replays) other bodies.
const SEED = process.env['FUZZ_SEED'] ? Number(process.env['FUZZ_SEED']) : 20_261_202;
/** Bodies per endpoint; the suite total is asserted to be at least 10 000 below. */
const RUNS = { 'corner-sweep': 3200, 'axle-roll': 2800, balance: 2800, solve: 1400 } as const;
type Endpoint = keyof typeof RUNS;
/** Health must answer within this between batches, ms (a generous bound for a shared 2-core machine). */
const HEALTH_LIMIT_MS = 1500;
const BATCH = 250;
/** Per endpoint; on a quiet 2-core machine each takes 10–25 s, this leaves room for a busy one. */
const TIME_LIMIT_MS = 240_000;
/** Bodies in flight at once (both compute workers busy, the event loop serving the rest). */
const PARALLEL = 4;
/** A valid solve costs 0.2–1 s; past this many, a body that would solve is broken once more before it is sent. */
const MAX_VALID_SOLVES = 12;

// ---------------------------------------------------------------- bodies

/*
 * Deep nesting: the API refuses bodies nested deeper than 64 levels with a 400
 * (server/http/body.ts, on the raw bytes before parsing); before that, ~3000 levels overflowed the stack
 * when the task was cloned to a worker (500). The mix stays at ≤ 2000 levels
 * because this file's own recursive JSON writer would overflow beyond that;
 * 5000 levels are tested directly in http.test.ts and below.
 */

/** A JSON text fragment sent as is (numbers JSON.stringify cannot write, deep nesting). */
class Raw {
  constructor(readonly text: string) {}
}

function toJsonText(v: unknown): string {
  if (v instanceof Raw) return v.text;
  if (v === undefined) return 'null';
  // Plain loops, not map/splice: a mutated array may carry an own `constructor` key, which breaks Symbol.species.
  if (Array.isArray(v)) return `[${Array.from({ length: v.length }, (_, i) => toJsonText(v[i])).join(',')}]`;
  if (v && typeof v === 'object') {
    return `{${Object.entries(v as Record<string, unknown>)
      .filter(([, x]) => x !== undefined)
      .map(([k, x]) => `${JSON.stringify(k)}:${toJsonText(x)}`)
      .join(',')}}`;
  }
  return JSON.stringify(v) ?? 'null';
}

/** Deep copy that keeps Raw fragments and own `__proto__` keys (structuredClone keeps neither). */
function clone(v: unknown): unknown {
  if (v instanceof Raw || v === null || typeof v !== 'object') return v;
  if (Array.isArray(v)) return Array.from({ length: v.length }, (_, i) => clone(v[i]));
  const out = {};
  for (const [k, x] of Object.entries(v)) Object.defineProperty(out, k, { value: clone(x), enumerable: true, writable: true, configurable: true });
  return out;
}
const bad = (n: number) => clone(BAD_VALUES[n % BAD_VALUES.length]);

const nested = (depth: number, open = '[', close = ']') => new Raw(open.repeat(depth) + '1' + close.repeat(depth));
const nestedObjects = (depth: number) => new Raw('{"a":'.repeat(depth) + '1' + '}'.repeat(depth));

/** Values a CAD export, a spreadsheet or an attacker might put anywhere. */
const BAD_VALUES: unknown[] = [
  null, // NaN and ±Infinity arrive as null through JSON.stringify
  new Raw('1e999'), // JSON.parse reads this as Infinity
  new Raw('-1e999'),
  1e308,
  -1e308,
  Number.MAX_SAFE_INTEGER,
  5e-324,
  -0,
  0,
  -1,
  1.5,
  '12',
  '',
  'NaN',
  'Infinity',
  'x'.repeat(5000),
  true,
  false,
  [],
  {},
  [1, 2],
  [1, 2, 3, 4],
  [null, null, null],
  [new Raw('1e999'), 0, 0],
  ['1', '2', '3'],
  { x: 1, y: 2, z: 3 },
  nested(50),
  nested(2000),
  nestedObjects(1500),
  JSON.parse('{"__proto__":{"polluted":true}}'),
  { constructor: { prototype: { polluted: true } } },
];

const EXTRA_KEYS = ['extra', '__proto__', 'constructor', 'toString', 'formatVersion', 'type', '', 'x'.repeat(300)];

type Json = unknown;
type PathStep = string | number;

/** Every path (objects and arrays, not the root) inside a JSON value. */
function pathsOf(v: Json, prefix: PathStep[] = [], out: PathStep[][] = []): PathStep[][] {
  if (v instanceof Raw) return out;
  if (Array.isArray(v)) {
    v.forEach((x, i) => {
      out.push([...prefix, i]);
      pathsOf(x, [...prefix, i], out);
    });
  } else if (v && typeof v === 'object') {
    for (const [k, x] of Object.entries(v)) {
      out.push([...prefix, k]);
      pathsOf(x, [...prefix, k], out);
    }
  }
  return out;
}

function getAt(root: Json, path: PathStep[]): Json {
  let v = root as Record<PathStep, Json>;
  for (const p of path) v = v?.[p] as Record<PathStep, Json>;
  return v;
}

function parentOf(root: Json, path: PathStep[]): { parent: Record<PathStep, Json> | Json[]; key: PathStep } | undefined {
  if (path.length === 0) return undefined;
  const parent = getAt(root, path.slice(0, -1));
  if (!parent || typeof parent !== 'object' || parent instanceof Raw) return undefined;
  return { parent: parent as Record<PathStep, Json>, key: path[path.length - 1]! };
}

type Mutation =
  | { kind: 'replace'; at: number; value: number }
  | { kind: 'delete'; at: number }
  | { kind: 'extra'; at: number; key: number; value: number }
  | { kind: 'scale'; at: number; factor: number }
  | { kind: 'coincide'; at: number; other: number }
  | { kind: 'travel'; variant: number; a: number; b: number }
  | { kind: 'formatVersion'; at: number; value: number }
  | { kind: 'wrapRoot'; value: number };

const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 6, arbitrary: fc.record({ kind: fc.constant('replace' as const), at: fc.nat(), value: fc.nat() }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('delete' as const), at: fc.nat() }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('extra' as const), at: fc.nat(), key: fc.nat(), value: fc.nat() }) },
  {
    weight: 3,
    arbitrary: fc.record({
      kind: fc.constant('scale' as const),
      at: fc.nat(),
      factor: fc.oneof(fc.constantFrom(0, -1, 1e6, -1e9, 1e300, 1e-300), fc.double({ min: -1e4, max: 1e4, noNaN: true })),
    }),
  },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('coincide' as const), at: fc.nat(), other: fc.nat() }) },
  {
    weight: 3,
    arbitrary: fc.record({
      kind: fc.constant('travel' as const),
      variant: fc.nat(),
      a: fc.oneof(fc.integer({ min: -2000, max: 2000 }), fc.double({ min: -1e6, max: 1e6, noNaN: true })),
      b: fc.oneof(fc.integer({ min: -2000, max: 2000 }), fc.double({ min: 1e-9, max: 100, noNaN: true })),
    }),
  },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('formatVersion' as const), at: fc.nat(), value: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('wrapRoot' as const), value: fc.nat() }) },
);

const FORMAT_VERSIONS: unknown[] = [0, 2, 3, 999, -1, 1.5, '1', null, new Raw('1e999'), [1], { v: 1 }];

/** The range fields of a request (travel, roll, trackProfile, fit window, options step). */
const RANGE_KEYS = ['travel', 'roll'];

function applyMutation(body: Json, m: Mutation): Json {
  const paths = pathsOf(body);
  const pick = (n: number) => (paths.length ? paths[n % paths.length]! : []);
  switch (m.kind) {
    case 'replace': {
      const where = parentOf(body, pick(m.at));
      if (where) (where.parent as Record<PathStep, Json>)[where.key] = bad(m.value);
      return body;
    }
    case 'delete': {
      const where = parentOf(body, pick(m.at));
      if (where) {
        if (Array.isArray(where.parent)) Array.prototype.copyWithin.call(where.parent, where.key as number, (where.key as number) + 1), (where.parent.length -= 1);
        else delete where.parent[where.key];
      }
      return body;
    }
    case 'extra': {
      const objects = [[], ...paths].filter((p) => {
        const v = getAt(body, p);
        return v && typeof v === 'object' && !Array.isArray(v) && !(v instanceof Raw);
      });
      const target = getAt(body, objects[m.at % objects.length] ?? []) as Record<string, Json> | undefined;
      if (target && typeof target === 'object') {
        Object.defineProperty(target, EXTRA_KEYS[m.key % EXTRA_KEYS.length]!, {
          value: bad(m.value),
          enumerable: true,
          writable: true,
          configurable: true,
        });
      }
      return body;
    }
    case 'scale': {
      const numeric = paths.filter((p) => typeof getAt(body, p) === 'number');
      const p = numeric[m.at % Math.max(1, numeric.length)];
      const where = p && parentOf(body, p);
      if (where) {
        const bag = where.parent as Record<PathStep, Json>;
        const scaled = (bag[where.key] as number) * m.factor;
        bag[where.key] = Number.isFinite(scaled) ? scaled : new Raw(scaled > 0 ? '1e999' : '-1e999');
      }
      return body;
    }
    case 'coincide': {
      // Two hardpoints on top of each other: links of zero length, undefined arms.
      const points = paths.filter((p) => p.includes('points') && Array.isArray(getAt(body, p)) && (getAt(body, p) as Json[]).length === 3);
      if (points.length >= 2) {
        const a = points[m.at % points.length]!;
        const b = points[m.other % points.length]!;
        const where = parentOf(body, a);
        if (where) (where.parent as Record<PathStep, Json>)[where.key] = clone(getAt(body, b));
      }
      return body;
    }
    case 'travel': {
      const b = body as Record<string, Json>;
      if (!b || typeof b !== 'object' || Array.isArray(b) || b instanceof Raw) return body;
      const key = RANGE_KEYS.find((k) => k in b);
      // Valid sweeps stay under ~2000 poses per rack (cheap); the pose cap itself is met by the two enormous variants.
      const step = Math.max(Math.abs(m.b), (2 * Math.abs(m.a)) / 2000);
      const ranges: Json[] = [
        { from: -m.a, to: m.a, step: m.b < 0 ? -step : step }, // huge or unreachable travel
        { from: Math.abs(m.a), to: -Math.abs(m.a), step }, // inverted
        { from: -5, to: 5, step: 0 },
        { from: -5, to: 5, step: -1 },
        { from: -25, to: 25, step: 1e-6 }, // enormous sweep
        { from: -1e9, to: 1e9, step: 1 },
        { from: 0, to: 0, step: 1 },
        { from: m.a, to: m.a + 10, step: 5 }, // a window far from design
      ];
      const range = ranges[m.variant % ranges.length];
      if (key) b[key] = range;
      // Spans of micrometres (once a NaN curvature in a 200) are refused by the intent schema now.
      else if ('trackProfile' in b) b['trackProfile'] = { id: 'smooth-circuit', travelMm: [-Math.abs(m.a), Math.abs(m.a)] };
      else if ('speedKph' in b || 'vehicle' in b) b['speedKph'] = m.a;
      if ('rackMm' in b || m.variant % 3 === 0) {
        const racks = [[m.a], [1e6], Array.from({ length: 30 }, (_, i) => i), [], [m.b, -m.b]];
        if (key) b['rackMm'] = racks[m.variant % racks.length];
      }
      return body;
    }
    case 'formatVersion': {
      const holders = [[], ...paths].filter((p) => {
        const v = getAt(body, p);
        return v && typeof v === 'object' && !Array.isArray(v) && 'formatVersion' in (v);
      });
      const target = getAt(body, holders[m.at % Math.max(1, holders.length)] ?? []) as Record<string, Json>;
      if (target && typeof target === 'object' && !(target instanceof Raw)) target['formatVersion'] = clone(FORMAT_VERSIONS[m.value % FORMAT_VERSIONS.length]);
      return body;
    }
    case 'wrapRoot': {
      const wraps = [() => [body], () => ({ request: body }), () => bad(m.value), () => nested(2000), () => 'corner'];
      return wraps[m.value % wraps.length]!();
    }
  }
}

const readFixtures = (dir: string) =>
  readdirSync(join('test', 'fixtures', dir))
    .filter((f) => f.endsWith('.json'))
    .map((f) => JSON.parse(readFileSync(join('test', 'fixtures', dir, f), 'utf8')) as Record<string, Json>);

const corners = [...Object.values(exampleCorners), ...readFixtures('corners')];
// The imperial fixture is CLI entry ("2888 lb" strings), converted before the engine sees it.
const vehicles = [...Object.values(exampleVehicles), ...readFixtures('vehicles').filter((v) => !/inch\/pound/.test(String(v['name'])))];
const intents = readFixtures('intents');

/** Valid requests per endpoint: small, so the ones that survive mutation stay cheap. */
const BASES: Record<Endpoint, Json[]> = {
  'corner-sweep': corners.map((corner, i) => ({ corner, travel: { from: -20, to: 20, step: 5 }, rackMm: i % 2 && corner['steered'] ? [-5, 0, 5] : [0] })),
  'axle-roll': corners.map((corner, i) => ({ corner, roll: { from: -2, to: 2, step: 0.5 }, ...(i % 2 ? { wheelbaseMm: 1550 } : {}) })),
  balance: [
    ...vehicles.map((vehicle, i) => ({
      vehicle,
      ...(i % 3 === 0 ? { frontCorner: exampleCorners.fsFrontWishbone, rearCorner: exampleCorners.fsRearWishbone } : {}),
      ...(i % 2 ? { speedKph: 80 } : { sensitivity: false }), // the sensitivity study is the costly part of a valid body
    })),
    // Oversteering variants: no characteristic speed, gains unstable above the critical speed (legitimate nulls).
    { vehicle: exampleVehicles.tur26Ember, overrides: { front: { rollSteerCoefficient: -1 }, rear: { rollSteerCoefficient: 1 } } },
    { vehicle: exampleVehicles.brackenfieldB3, overrides: { rear: { rollSteerCoefficient: 1 } } },
  ],
  solve: intents.map((intent) => ({ ...intent, options: { ...(intent['options'] as object | undefined), familySize: 3 } })),
};

/** The generated value is the recipe (small, so fast-check prints it readably); the body is built from it. */
const recipeArb = fc.record({ base: fc.nat(), mutations: fc.array(mutationArb, { minLength: 1, maxLength: 3 }) });

function bodyText(endpoint: Endpoint, recipe: { base: number; mutations: Mutation[] }): string {
  let body: Json = clone(BASES[endpoint][recipe.base % BASES[endpoint].length]);
  for (const m of recipe.mutations) body = applyMutation(body, m);
  return toJsonText(body);
}

// ---------------------------------------------------------------- checks

/**
 * JSON turns NaN and ±Infinity into null, so a null in a 200 body could hide
 * one. The same body is therefore run through the engine in this process and
 * its raw result (before JSON) walked for non-finite numbers. (Fields that are
 * documented as `number | null` come out as null there, not as NaN.)
 */
function nonFinite(v: unknown, path: string, out: string[]): string[] {
  if (typeof v === 'number' && !Number.isFinite(v)) out.push(`${path} is ${v}`);
  else if (Array.isArray(v)) v.forEach((x, i) => nonFinite(x, `${path}[${i}]`, out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) nonFinite(x, `${path}.${k}`, out);
  return out;
}

const LOCAL_ENGINES: Record<Endpoint, (input: unknown) => unknown> = {
  'corner-sweep': computeCornerSweep,
  'axle-roll': computeAxleRoll,
  balance: computeBalance,
  // computeSolve itself replaces non-finite numbers by null: walk the solver's own result.
  solve: (input) => solveIntent(parseOrThrow(intentSchema, input, 'intent')),
};

interface Tally {
  sent: number;
  byStatus: Map<number, number>;
  validSolves: number;
}

const tally: Record<Endpoint, Tally> = {
  'corner-sweep': { sent: 0, byStatus: new Map(), validSolves: 0 },
  'axle-roll': { sent: 0, byStatus: new Map(), validSolves: 0 },
  balance: { sent: 0, byStatus: new Map(), validSolves: 0 },
  solve: { sent: 0, byStatus: new Map(), validSolves: 0 },
};

/** A message that starts with the field it is about, e.g. `rear: lateral load transfer …`. */
const LEADING_FIELD = /^[A-Za-z][\w.[\]-]*: /;
const SOLVE_WORDS = /travel|rack|roll|link|point|step|time|pose|bound|corner|target|\bat\b/i;

/** The check of one answer; returns a description of what is wrong, or undefined. */
function judge(endpoint: Endpoint, status: number, body: Record<string, unknown> | undefined, sent: string): string | undefined {
  if (status >= 500) return `status ${status}: ${JSON.stringify(body).slice(0, 400)}`;
  if (status === 200) {
    if (!body || typeof body['engineVersion'] !== 'string' || !('result' in body)) return `200 without { engineVersion, result }`;
    const problems = nonFinite(LOCAL_ENGINES[endpoint](JSON.parse(sent)), 'result', []);
    nonFinite(body['result'], 'result', problems);
    return problems.length ? `200 with ${problems.slice(0, 5).join('; ')}` : undefined;
  }
  const error = (body?.['error'] ?? undefined) as { code?: unknown; message?: unknown; details?: Record<string, unknown> } | undefined;
  if (!error || typeof error.code !== 'string' || typeof error.message !== 'string' || error.message === '') return `status ${status} without the error shape`;
  // A stack frame: `at fn (file:line:col)`; prose such as "at infinity (the lines…)" is not one.
  if (/\bat \S+ \([^)]*:\d+:\d+\)|node_modules|\.ts:\d+/.test(JSON.stringify(body))) return `status ${status} leaks a stack trace: ${JSON.stringify(body).slice(0, 800)}`;
  if (status === 400) {
    if (error.code === 'malformed_json') return undefined; // no field to name in unparsable text
    const fields = error.details?.['fields'] as { path?: unknown; message?: unknown }[] | undefined;
    const first = fields?.[0];
    if (!first || typeof first.path !== 'string' || first.path === '') return `400 ${error.code} without details.fields naming a field`;
    // The message names the field: its full path, or a leading part of it (`vehicle: …` for vehicle.front).
    const segments = first.path.split(/[.[]/);
    const message = error.message;
    const named = message.includes(first.path) || segments.some((_, i) => message.includes(`${segments.slice(0, i + 1).join('.')}: `));
    if (first.path !== '(root)' && !named) return `400 message "${error.message}" does not name ${first.path}`;
    return undefined;
  }
  if (status === 413) return error.code === 'payload_too_large' ? undefined : `413 ${error.code}`;
  if (status === 422) {
    const details = error.details ?? {};
    if (!SOLVE_WORDS.test(error.message) && !LEADING_FIELD.test(error.message) && !['travelMm', 'rackMm', 'link', 'path', 'timeLimitMs'].some((k) => k in details)) {
      return `422 ${error.code} "${error.message}" names neither travel, rack, link nor field`;
    }
    return undefined;
  }
  return `unexpected status ${status} ${error.code}: ${error.message}`;
}

// ---------------------------------------------------------------- the run

let t: TestApp;
let server: Server;
let user: ReturnType<typeof request.agent>;
let slowestHealthMs = 0;

beforeAll(async () => {
  console.log(`fuzz-compute seed ${SEED} (replay: FUZZ_SEED=${SEED})`);
  t = await startTestApp({ config: { computeTimeLimitMs: 3000 } });
  server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  user = request.agent(server).set('X-Rollwise-Request', '1');
  const r = await user.post('/api/auth/register').send({ email: 'fuzz@fuzz.example', password: 'long-enough-pass', displayName: 'Fuzz Runner' });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  // Every base request is valid: the mutations start from something that works. Checked on an app with
  // the tests' default time limit (helpers.ts): the fuzzing app's 3 s limit (which keeps runaway mutations short)
  // also counts a worker thread loading the engines, which on a busy machine can take longer than that.
  const checker = await startTestApp();
  try {
    const checkerUser = request.agent(checker.app).set('X-Rollwise-Request', '1');
    const reg = await checkerUser.post('/api/auth/register').send({ email: 'fuzz-check@fuzz.example', password: 'long-enough-pass', displayName: 'Fuzz Checker' });
    expect(reg.status, JSON.stringify(reg.body)).toBe(201);
    for (const endpoint of Object.keys(BASES) as Endpoint[]) {
      for (const base of BASES[endpoint]) {
        const ok = await checkerUser.post(`/api/compute/${endpoint}`).send(base as object);
        expect(ok.status, `${endpoint} base request: ${JSON.stringify(ok.body).slice(0, 300)}`).toBe(200);
      }
    }
  } finally {
    await checker.close();
  }
}, 120_000);

afterAll(async () => {
  await new Promise<void>((resolve) => {
    server?.close(() => resolve());
    server?.closeAllConnections();
  });
  await t?.close();
  const lines = (Object.keys(tally) as Endpoint[]).map(
    (e) => `${e}: ${tally[e].sent} bodies, ${[...tally[e].byStatus].sort((a, b) => a[0] - b[0]).map(([s, n]) => `${s}×${n}`).join(' ')}`,
  );
  console.log(`fuzz-compute seed ${SEED}; slowest health ${slowestHealthMs.toFixed(0)} ms\n  ${lines.join('\n  ')}`);
});

async function healthIsFast(): Promise<void> {
  const start = performance.now();
  const r = await request(server).get('/api/health');
  const ms = performance.now() - start;
  slowestHealthMs = Math.max(slowestHealthMs, ms);
  expect(r.status).toBe(200);
  expect(ms, 'health between fuzz batches').toBeLessThan(HEALTH_LIMIT_MS);
}

/** A body that would start a real solve, once the budget of those is spent, gets an unknown track profile too. */
function keepSolvesCheap(text: string): string {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
    if (!intentSchema.safeParse(parsed).success) return text;
  } catch {
    return text;
  }
  if (tally.solve.validSolves < MAX_VALID_SOLVES) {
    tally.solve.validSolves++;
    return text;
  }
  // Native JSON.stringify: the parsed body may keep a deeply nested extra field (a request schema that strips unknown keys), too deep for toJsonText's recursion.
  return JSON.stringify({ ...(parsed as object), trackProfile: 'no-such-profile' });
}

async function sendOne(endpoint: Endpoint, recipe: { base: number; mutations: Mutation[] }): Promise<void> {
  const text = bodyText(endpoint, recipe);
  const sent = endpoint === 'solve' ? keepSolvesCheap(text) : text;
  const r = await user.post(`/api/compute/${endpoint}`).set('Content-Type', 'application/json').send(sent);
  const tl = tally[endpoint];
  tl.sent++;
  tl.byStatus.set(r.status, (tl.byStatus.get(r.status) ?? 0) + 1);
  const wrong = judge(endpoint, r.status, r.body as Record<string, unknown>, sent);
  if (wrong) throw new Error(`${endpoint}: ${wrong}\nbody (${sent.length} chars): ${sent.slice(0, 600)}`);
}

function fuzz(endpoint: Endpoint, runs: number, seedOffset: number) {
  return async () => {
    const started = performance.now();
    const before = tally[endpoint].sent;
    let batches = 0;
    await fc.assert(
      // Each run is PARALLEL recipes sent at once; fast-check prints the failing group.
      fc.asyncProperty(fc.array(recipeArb, { minLength: PARALLEL, maxLength: PARALLEL }), async (group) => {
        await Promise.all(group.map((recipe) => sendOne(endpoint, recipe)));
        if (++batches % Math.round(BATCH / PARALLEL) === 0) await healthIsFast();
      }),
      { seed: SEED + seedOffset, numRuns: Math.ceil(runs / PARALLEL), endOnFailure: true },
    );
    await healthIsFast();
    console.log(`${endpoint}: ${tally[endpoint].sent - before} bodies in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  };
}

describe('compute endpoints under fuzzed bodies', () => {
  it('corner-sweep', fuzz('corner-sweep', RUNS['corner-sweep'], 1), TIME_LIMIT_MS);
  it('axle-roll', fuzz('axle-roll', RUNS['axle-roll'], 2), TIME_LIMIT_MS);
  it('balance', fuzz('balance', RUNS.balance, 3), TIME_LIMIT_MS);
  it('solve', fuzz('solve', RUNS.solve, 4), TIME_LIMIT_MS);

  it('every compute endpoint refuses 5000 levels of nesting with a 400 and stays up', async () => {
    for (const endpoint of Object.keys(RUNS) as Endpoint[]) {
      for (const body of ['['.repeat(5000) + '1' + ']'.repeat(5000), '{"corner":'.repeat(5000) + '1' + '}'.repeat(5000)]) {
        const r = await user.post(`/api/compute/${endpoint}`).set('Content-Type', 'application/json').send(body);
        expect(r.status, endpoint).toBe(400);
        expect(r.body.error.message).toMatch(/nested deeper than 64 levels/);
      }
    }
    await healthIsFast();
  });

  it('sent at least 10 000 bodies in all, and some of each kind of answer', () => {
    const total = Object.values(tally).reduce((s, x) => s + x.sent, 0);
    expect(total).toBeGreaterThanOrEqual(10_000);
    for (const e of Object.keys(tally) as Endpoint[]) {
      // Mutations that keep a request valid (a numeric scale, an extra field where the request schema ignores
      // one) and ones that break it (an extra field inside a corner document is an unknown key: 400 naming it).
      expect(tally[e].byStatus.get(400) ?? 0, `${e} 400s`).toBeGreaterThan(0);
      expect(tally[e].byStatus.get(200) ?? 0, `${e} 200s`).toBeGreaterThan(0);
    }
  });
});
