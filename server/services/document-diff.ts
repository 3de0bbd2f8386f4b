/**
 * Side-by-side differences of two JSON documents (inputs or results):
 * leaves are compared by dotted path. Arrays are compared whole by default
 * (curves and tables are shown by the app, not listed value by value).
 */

export interface Difference {
  path: string;
  a: unknown;
  b: unknown;
  /** b − a, when both sides are numbers. */
  change?: number;
}

export interface DiffOptions {
  /** Top-level or dotted paths to leave out (e.g. long text, echo of inputs). */
  skip?: readonly string[];
  /** List array elements one by one (inputs: hardpoint coordinates) instead of comparing arrays whole. */
  expandArrays?: boolean;
  /** Drop arrays altogether (results: curves are not key figures). */
  dropArrays?: boolean;
}

function flatten(value: unknown, o: DiffOptions, path = '', out = new Map<string, unknown>()): Map<string, unknown> {
  if (o.skip?.includes(path)) return out;
  if (Array.isArray(value)) {
    if (o.dropArrays) return out;
    if (!o.expandArrays) {
      out.set(path, value);
      return out;
    }
    value.forEach((v, i) => flatten(v, o, `${path}[${i}]`, out));
    return out;
  }
  if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) flatten(v, o, path ? `${path}.${k}` : k, out);
    return out;
  }
  out.set(path, value);
  return out;
}

const same = (x: unknown, y: unknown) => (typeof x === 'object' || typeof y === 'object' ? JSON.stringify(x) === JSON.stringify(y) : x === y);

/** Every path whose value differs (present on one side only counts), in path order. */
export function diffDocuments(a: unknown, b: unknown, o: DiffOptions = {}): Difference[] {
  const fa = flatten(a, o);
  const fb = flatten(b, o);
  const paths = [...new Set([...fa.keys(), ...fb.keys()])].sort();
  const out: Difference[] = [];
  for (const path of paths) {
    const x = fa.has(path) ? fa.get(path) : null;
    const y = fb.has(path) ? fb.get(path) : null;
    if (same(x, y)) continue;
    const d: Difference = { path, a: x, b: y };
    if (typeof x === 'number' && typeof y === 'number') d.change = y - x;
    out.push(d);
  }
  return out;
}
