/**
 * The back-solver's search, independent of the kinematics: free coordinates
 * q (mm) in a box, one target constraint C(q) = ε(q) − ε* = 0 and one
 * objective J(q) to minimise over what the target leaves free.
 *
 * Design (docs/intent.md): the coordinate with the most authority over ε
 * inside its bounds (|∂ε/∂q|·range) is the "primary" and solves the target
 * by a secant search (ε is very nearly linear in small height changes, so
 * two or three steps). The others span the solution family: for two free
 * coordinates a curve, parametrised by the second coordinate over the part
 * of its range where the primary stays inside its bounds. J is minimised
 * along it by a grid (the returned family members) and Brent's method around
 * the best member; with more coordinates, cyclic coordinate searches of the
 * same kind. Among members whose J equals the best within a tolerance, the
 * one nearest (Euclidean, mm) the current geometry wins.
 */
import { brentMinimise, secantRoot } from './numeric.js';

export interface FamilyProblem {
  names: string[];
  lo: number[];
  hi: number[];
  /** Current values (the geometry as entered); may lie outside the bounds. */
  current: number[];
  /** ε(q) − ε*, deg/deg. */
  constraint: (q: number[]) => number;
  /** The objective to minimise (deg), with any penalty already added. */
  objective: (q: number[]) => number;
  /** |C| at or below this meets the target. */
  tolConstraint: number;
  familySize: number;
  onProgress?: ((fraction: number, message: string) => void) | undefined;
}

export interface FamilyMember {
  q: number[];
  constraint: number;
  objective: number;
  /** The primary coordinate met the target inside its bounds. */
  feasible: boolean;
}

export interface LimitingBound {
  /** The movable coordinate, or an option such as `options.worstToeBoundDeg`. */
  coordinate: string;
  side: 'min' | 'max';
  /** The bound's value, in `unit`. */
  value: number;
  unit: 'mm' | 'deg' | '%';
}

export interface FamilyOutcome {
  feasible: boolean;
  q: number[];
  constraint: number;
  objective: number;
  primary: string;
  /** The coordinate that parametrises the returned family, or null with one free coordinate. */
  parameter: string | null;
  family: FamilyMember[];
  /** Bounds that stop the target (infeasible), strongest first. */
  limiting: LimitingBound[];
  /** ∂ε/∂q at the (clamped) current geometry, per mm. */
  gradient: number[];
  tieBreak: 'unique' | 'nearest-current';
  evaluations: { constraint: number; objective: number };
}

const GRADIENT_STEP_MM = 0.5;
/** Objective values within this of the best count as equally good, deg (above the noise of the pose solver and of the target search, ~1e-11 deg). */
export const OBJECTIVE_TIE_TOL_DEG = 1e-10;
const FAIL = 1e6;
/** A tie-break must bring the solution this much nearer the current geometry to count, mm. */
export const TIE_MOVE_MM = 0.01;

export function solveFamily(p: FamilyProblem): FamilyOutcome {
  const n = p.names.length;
  const counts = { constraint: 0, objective: 0 };
  const C = (q: number[]) => {
    counts.constraint++;
    return p.constraint(q);
  };
  const objCache = new Map<string, number>();
  const J = (q: number[]) => {
    const key = q.map((v) => v.toFixed(9)).join(',');
    const hit = objCache.get(key);
    if (hit !== undefined) return hit;
    counts.objective++;
    const v = p.objective(q);
    objCache.set(key, v);
    return v;
  };
  const clampI = (i: number, v: number) => Math.min(p.hi[i]!, Math.max(p.lo[i]!, v));
  const q0 = p.current.map((v, i) => clampI(i, v));
  const c0 = C(q0);
  const gradient = q0.map((v, i) => {
    // A step that stays inside the box (toward the side with more room).
    const step = Math.min(GRADIENT_STEP_MM, (p.hi[i]! - p.lo[i]!) / 4);
    const h = v + step <= p.hi[i]! ? step : -step;
    const q = [...q0];
    q[i] = v + h;
    return (C(q) - c0) / h;
  });
  const authority = gradient.map((g, i) => Math.abs(g) * (p.hi[i]! - p.lo[i]!));
  const order = authority.map((_, i) => i).sort((a, b) => authority[b]! - authority[a]!);
  const pi = order[0]!;
  const maxAuthority = authority[pi]!;
  const distance = (q: number[]) => Math.hypot(...q.map((v, i) => v - p.current[i]!));
  const outcome = (o: Omit<FamilyOutcome, 'gradient' | 'evaluations' | 'primary'>): FamilyOutcome => ({
    ...o,
    primary: p.names[pi]!,
    gradient,
    evaluations: counts,
  });

  // Already on target with a single coordinate: nothing to move.
  if (Math.abs(c0) <= p.tolConstraint && n === 1) {
    const m = { q: q0, constraint: c0, objective: J(q0), feasible: true };
    return outcome({ feasible: true, q: q0, constraint: c0, objective: m.objective, parameter: null, family: [m], limiting: [], tieBreak: 'unique' });
  }

  // The box corner that moves ε furthest toward the target (ε is near-linear).
  const dir = -Math.sign(c0);
  // Coordinates with next to no authority stay where they are (nearest the current geometry).
  const strong = (i: number) => authority[i]! > 1e-3 * maxAuthority;
  const vertex = q0.map((v, i) => (!strong(i) ? v : gradient[i]! * dir > 0 ? p.hi[i]! : gradient[i]! * dir < 0 ? p.lo[i]! : v));
  let start = q0;
  if (Math.abs(c0) > p.tolConstraint) {
    const cv = C(vertex);
    if (Math.sign(cv) === Math.sign(c0) && Math.abs(cv) > p.tolConstraint) {
      const limiting: LimitingBound[] = order
        .filter(strong)
        .map((i) => ({ coordinate: p.names[i]!, side: vertex[i] === p.hi[i] ? ('max' as const) : ('min' as const), value: vertex[i]!, unit: 'mm' as const }));
      return outcome({ feasible: false, q: vertex, constraint: cv, objective: J(vertex), parameter: null, family: [], limiting, tieBreak: 'unique' });
    }
    // A point on the target between the current geometry and that corner.
    const seg = (t: number) => q0.map((v, i) => v + t * (vertex[i]! - v));
    const r = secantRoot((t) => C(seg(t)), 0, cv - c0, 0, 1, p.tolConstraint);
    start = seg(r.x);
  }

  /** Solves the primary coordinate for the others in q; guess from the linear model. */
  const solveP = (q: number[]): FamilyMember => {
    const y = [...q];
    const guessC = C(y);
    if (Math.abs(guessC) <= p.tolConstraint) return { q: y, constraint: guessC, objective: NaN, feasible: true };
    const r = secantRoot(
      (t) => {
        if (t === q[pi]) return guessC;
        y[pi] = t;
        return C(y);
      },
      q[pi]! - guessC / gradient[pi]!,
      gradient[pi]!,
      p.lo[pi]!,
      p.hi[pi]!,
      p.tolConstraint,
    );
    y[pi] = r.x;
    return { q: y, constraint: r.fx, objective: NaN, feasible: r.found };
  };
  const withObjective = (m: FamilyMember): FamilyMember => ({ ...m, objective: m.feasible ? J(m.q) : FAIL });

  if (n === 1) {
    const m = withObjective(solveP(start));
    return outcome({ feasible: m.feasible, q: m.q, constraint: m.constraint, objective: m.objective, parameter: null, family: [m], limiting: [], tieBreak: 'unique' });
  }

  let x = withObjective(solveP(start));
  const others = order.slice(1);
  const ki = others[0]!;
  const passes: number[] = n > 2 ? [...others.slice(1), ki, ...others.slice(1), ki] : [ki];
  let family: FamilyMember[] = [];
  let tieBreak: FamilyOutcome['tieBreak'] = 'unique';

  passes.forEach((j, passIndex) => {
    const last = passIndex === passes.length - 1;
    p.onProgress?.((passIndex + 0.2) / passes.length, `searching along ${p.names[j]}`);
    const member = (s: number) => {
      const q = [...x.q];
      q[j] = s;
      // Linear prediction of the primary keeps the secant search short.
      q[pi] = clampI(pi, x.q[pi]! - (gradient[j]! / gradient[pi]!) * (s - x.q[j]!));
      return solveP(q);
    };
    // Range of q_j where the predicted primary stays inside its bounds.
    const r = -gradient[j]! / gradient[pi]!;
    let a = p.lo[j]!;
    let b = p.hi[j]!;
    if (r !== 0 && Number.isFinite(r)) {
      const s1 = x.q[j]! + (p.lo[pi]! - x.q[pi]!) / r;
      const s2 = x.q[j]! + (p.hi[pi]! - x.q[pi]!) / r;
      a = Math.max(a, Math.min(s1, s2));
      b = Math.min(b, Math.max(s1, s2));
    }
    if (!(a <= x.q[j]! && x.q[j]! <= b)) {
      a = Math.min(a, x.q[j]!);
      b = Math.max(b, x.q[j]!);
    }
    // Pull an end in until the primary really meets the target there (nonlinearity).
    const settle = (end: number): number => {
      let good = x.q[j]!;
      let bad = end;
      if (member(bad).feasible) return bad;
      for (let i = 0; i < 12 && Math.abs(bad - good) > 1e-4; i++) {
        const mid = 0.5 * (good + bad);
        if (member(mid).feasible) good = mid;
        else bad = mid;
      }
      return good;
    };
    a = settle(a);
    b = settle(b);
    const m = last ? p.familySize : 9;
    const grid: FamilyMember[] = [];
    for (let i = 0; i < m; i++) grid.push(withObjective(member(a + ((b - a) * i) / (m - 1))));
    let bi = -1;
    grid.forEach((g, i) => {
      if (g.feasible && (bi < 0 || g.objective < grid[bi]!.objective)) bi = i;
    });
    if (bi >= 0 && grid[bi]!.objective < x.objective) x = grid[bi]!;
    if (bi >= 0 && b > a) {
      const lo = grid[Math.max(0, bi - 1)]!.q[j]!;
      const hi = grid[Math.min(m - 1, bi + 1)]!.q[j]!;
      const f = (s: number) => withObjective(member(s)).objective;
      const best = brentMinimise(f, lo, hi, 1e-5, 60, { x: grid[bi]!.q[j]!, fx: grid[bi]!.objective });
      const bm = withObjective(member(best.x));
      if (bm.feasible && bm.objective <= x.objective) x = bm;
    }
    if (last) {
      family = grid;
      // Equally good members: take the one nearest the current geometry.
      const tol = OBJECTIVE_TIE_TOL_DEG;
      const equal = (mm: FamilyMember) => mm.feasible && mm.objective <= x.objective + tol;
      const rr = r !== 0 && Number.isFinite(r) ? r : 0;
      const sNear = Math.min(b, Math.max(a, (p.current[j]! + rr * (p.current[pi]! - x.q[pi]! + rr * x.q[j]!)) / (1 + rr * rr)));
      const near = withObjective(member(sNear));
      let pick = x;
      // Only a tie region reaching TIE_MOVE_MM toward the current geometry can change the answer: probe that first.
      const probeS = x.q[j]! + Math.sign(sNear - x.q[j]!) * Math.min(Math.abs(sNear - x.q[j]!), TIE_MOVE_MM);
      if (equal(near)) pick = near;
      else if (equal(withObjective(member(probeS)))) {
        let inS = probeS;
        let outS = sNear;
        for (let i = 0; i < 20 && Math.abs(outS - inS) > 1e-6; i++) {
          const mid = 0.5 * (inS + outS);
          if (equal(withObjective(member(mid)))) inS = mid;
          else outS = mid;
        }
        const edge = withObjective(member(inS));
        if (equal(edge)) pick = edge;
      }
      for (const g of grid) if (equal(g) && distance(g.q) < distance(pick.q)) pick = g;
      // Moves below a hundredth of a millimetre are search noise, not a different solution.
      if (distance(pick.q) < distance(x.q) - TIE_MOVE_MM) {
        tieBreak = 'nearest-current';
        x = pick;
      }
    }
  });
  return outcome({
    feasible: x.feasible,
    q: x.q,
    constraint: x.constraint,
    objective: x.objective,
    parameter: p.names[ki]!,
    family,
    limiting: [],
    tieBreak,
  });
}
