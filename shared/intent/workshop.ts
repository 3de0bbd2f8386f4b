/**
 * Workshop numbers: what a mechanic does to turn the current corner into the
 * proposed one. The moved link's length and its change, a shim stack at each end for
 * the height changes (whole shims of the stated thickness, so the "as built"
 * geometry is what the shims really give), the adjuster turns for the
 * length change, and moves that are not shim work (lateral or fore-aft). Where
 * the adjuster's reach or the tallest shim stack cannot make the change, it
 * says a new link or bracket is needed instead of giving turns.
 */
import type { Corner, Vec3 } from '../schema/corner.js';
import { innerName, outerName } from '../schema/steering-link.js';

export interface ShimStack {
  end: 'inner' | 'outer';
  point: string;
  /** Height change the solution asks for at this end, mm (+ up). */
  heightChangeMm: number;
  shimThicknessMm: number;
  /** Shims to add (+, raising the point) or remove (−). */
  shims: number;
  /** Height change the whole shims give, mm (= shims × thickness). */
  stackMm: number;
  /** What the whole shims leave unmet, mm. */
  residualMm: number;
}

export interface WorkshopNumbers {
  /** The link whose ends move, in the trade's words: "tie rod" (steered), "toe link" (not steered), "link 5 (toe link)" (five-link). */
  link: string;
  tieRod: { lengthBeforeMm: number; lengthAfterMm: number; changeMm: number; asBuiltLengthMm: number };
  shims: ShimStack[];
  adjuster: {
    kind: 'single-thread' | 'turnbuckle';
    threadPitchMm: number;
    /** Length change per turn, mm (one pitch, or two for a turnbuckle). */
    lengthPerTurnMm: number;
    /** Turns for the as-built length change, + lengthens. */
    turns: number;
    direction: 'lengthen' | 'shorten' | 'none';
    /** Length change either way the adjuster can make, mm. */
    reachMm: number;
    /** Whether the as-built length change is within that reach. */
    withinReach: boolean;
  };
  /** Tallest shim stack an end takes, mm. */
  shimStackMaxMm: number;
  /**
   * What the adjusters cannot do, in words ("a new link or bracket is needed …"); empty when shims
   * and the thread adjuster reach the proposal. Lateral and fore-aft moves are always new parts.
   */
  newParts: string[];
  /** Moves that are not shim work: new bracket, arm or rack length, mm. */
  otherMoves: { point: string; axis: 'x' | 'y'; changeMm: number }[];
}

const length = (a: Vec3, b: Vec3) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);

/** Rounds to whole shims of thickness t (half away from zero), mm. */
export function shimCount(changeMm: number, t: number): number {
  const n = changeMm / t;
  // 1e-9 guards a change that is an exact multiple against floating error.
  return Math.sign(n) * Math.floor(Math.abs(n) + 0.5 + 1e-9);
}

/**
 * The proposed corner with each end's height rounded to whole shims of the
 * current geometry's height (lateral and fore-aft moves kept as proposed).
 */
export function asBuiltCorner(current: Corner, proposed: Corner, shimThicknessMm: number): Corner {
  const cp = current.points as Record<string, Vec3>;
  const pp = proposed.points as Record<string, Vec3>;
  const points = { ...pp };
  for (const name of [innerName(current), outerName(current)]) {
    const dz = pp[name]![2] - cp[name]![2];
    points[name] = [pp[name]![0], pp[name]![1], cp[name]![2] + shimCount(dz, shimThicknessMm) * shimThicknessMm];
  }
  let steering = proposed.steering;
  if (steering?.kind === 'arm' && current.steering?.kind === 'arm') {
    // The steering-box arm axis follows the inner point's height as built.
    const dz = points[innerName(current)]![2] - cp[innerName(current)]![2] - (pp[innerName(current)]![2] - cp[innerName(current)]![2]);
    steering = { ...steering, armAxisPoint: [steering.armAxisPoint[0], steering.armAxisPoint[1], steering.armAxisPoint[2] + dz] };
  }
  return { ...proposed, points, ...(steering ? { steering } : {}) } as Corner;
}

export function workshopNumbers(
  current: Corner,
  proposed: Corner,
  opts: { shimThicknessMm: number; threadPitchMm: number; adjuster: 'single-thread' | 'turnbuckle'; adjusterReachMm: number; shimStackMaxMm: number },
): WorkshopNumbers {
  const inner = innerName(current);
  const outer = outerName(current);
  const cp = current.points as Record<string, Vec3>;
  const pp = proposed.points as Record<string, Vec3>;
  const built = asBuiltCorner(current, proposed, opts.shimThicknessMm).points as Record<string, Vec3>;
  const before = length(cp[inner]!, cp[outer]!);
  const after = length(pp[inner]!, pp[outer]!);
  const asBuilt = length(built[inner]!, built[outer]!);
  const shims: ShimStack[] = (['inner', 'outer'] as const).map((end) => {
    const point = end === 'inner' ? inner : outer;
    const dz = pp[point]![2] - cp[point]![2];
    const n = shimCount(dz, opts.shimThicknessMm);
    return { end, point, heightChangeMm: dz, shimThicknessMm: opts.shimThicknessMm, shims: n, stackMm: n * opts.shimThicknessMm, residualMm: dz - n * opts.shimThicknessMm };
  });
  const perTurn = opts.adjuster === 'turnbuckle' ? 2 * opts.threadPitchMm : opts.threadPitchMm;
  const dl = asBuilt - before;
  const otherMoves: WorkshopNumbers['otherMoves'] = [];
  for (const point of [inner, outer]) {
    for (const [axis, k] of [['x', 0], ['y', 1]] as const) {
      const d = pp[point]![k] - cp[point]![k];
      if (Math.abs(d) > 1e-9) otherMoves.push({ point, axis, changeMm: d });
    }
  }
  const link = linkName(current);
  const withinReach = Math.abs(dl) <= opts.adjusterReachMm + 1e-9;
  const newParts: string[] = [];
  if (!withinReach) {
    newParts.push(
      `A new link or bracket is needed: the ${link} must ${dl > 0 ? 'lengthen' : 'shorten'} by ${round2(Math.abs(dl))} mm, beyond the adjuster's reach of ${round2(opts.adjusterReachMm)} mm.`,
    );
  }
  for (const s of shims) {
    if (Math.abs(s.stackMm) > opts.shimStackMaxMm + 1e-9) {
      newParts.push(
        `A new bracket is needed at the ${link}'s ${s.end} end: it must ${s.stackMm > 0 ? 'rise' : 'drop'} by ${round2(Math.abs(s.stackMm))} mm, more than a ${round2(opts.shimStackMaxMm)} mm shim stack.`,
      );
    }
  }
  for (const o of otherMoves) {
    newParts.push(`A new link or bracket is needed: the ${link}'s ${o.point === inner ? 'inner' : 'outer'} end moves ${o.axis === 'x' ? 'fore-aft' : 'sideways'} by ${round2(o.changeMm)} mm, which shims and the adjuster cannot do.`);
  }
  return {
    link,
    tieRod: { lengthBeforeMm: before, lengthAfterMm: after, changeMm: after - before, asBuiltLengthMm: asBuilt },
    shims,
    adjuster: {
      kind: opts.adjuster,
      threadPitchMm: opts.threadPitchMm,
      lengthPerTurnMm: perTurn,
      turns: dl / perTurn,
      direction: Math.abs(dl) < 1e-9 ? 'none' : dl > 0 ? 'lengthen' : 'shorten',
      reachMm: opts.adjusterReachMm,
      withinReach,
    },
    shimStackMaxMm: opts.shimStackMaxMm,
    newParts,
    otherMoves,
  };
}

const round2 = (v: number) => String(Math.round(v * 100) / 100);

/**
 * The link whose ends the solver moves, as the trade names it: a steered corner's
 * tie rod, an unsteered corner's toe link, a five-link's toe link by its number.
 */
export function linkName(corner: Corner): string {
  if (corner.type === 'five-link') return `link ${corner.toeLink} (toe link)`;
  return corner.steered ? 'tie rod' : 'toe link';
}
