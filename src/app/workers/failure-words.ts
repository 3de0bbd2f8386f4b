import type { AnalysisFailure } from './analysis-types';
import type { DisplayUnits } from '../core/api-types';
import { formatNum } from '../core/format/num';
import { kindForUnit, QUANTITIES, unitLabel } from '../core/format/quantities';

/**
 * An engine failure in the user's words, for the editor, its views and the
 * intent panel: where the linkage stopped (travel as bump or droop, the rack),
 * which link could not close in the trade's words; never a document key
 * (`trackProfile.travelMm`), a point-key pair (`rodOuter–rodRocker`) or an
 * unrounded figure. Every figure is written by the one formatter (`formatNum`)
 * in the user's unit system (`units`, from DISPLAY_UNITS): the structured
 * travel, rack and travel range, and the figures with a unit inside a
 * message ("25.4 mm" is "1 in" for an inch/pound user).
 */
export function failureWords(f: AnalysisFailure, units: DisplayUnits): string {
  const n = (mm: number) => formatNum(mm, { kind: 'length' }, units);
  const u = unitLabel('length', units);
  const d = (f.details && typeof f.details === 'object' ? f.details : {}) as Record<string, unknown>;
  const travel = typeof d['travelMm'] === 'number' ? d['travelMm'] : null;
  const rack = typeof d['rackMm'] === 'number' ? d['rackMm'] : null;
  if ((f.code === 'unreachable_pose' || f.code === 'no_convergence') && travel !== null) {
    const where = `${travel === 0 ? 'ride height' : `${n(Math.abs(travel))} ${u} of ${travel > 0 ? 'bump' : 'droop'}`}${rack ? ` with the rack at ${n(rack)} ${u}` : ''}${d['side'] === 'right' ? ' (right corner)' : ''}`;
    const link = typeof d['link'] === 'string' ? plainLink(d['link']) : null;
    const why = !link || link.startsWith('wheel-centre height') ? 'the travel is beyond what the links allow' : `the ${link} cannot reach`;
    const tr = Array.isArray(d['travelRangeMm']) ? (d['travelRangeMm'] as unknown[]).map(Number) : null;
    const range = tr ? ` Narrow the travel range (now ${n(tr[0]!)} to ${n(tr[1]!)} ${u}) to what the corner can reach.` : '';
    return `The linkage cannot reach ${where}: ${why}.${range}`;
  }
  return figuresIn(plainText(f.message), units);
}

const NUMBER = String.raw`[−-]?\d+(?:\.\d+)?(?:e[−-]?\d+)?`;
/** The stored units a message may carry a figure in, longest first ("mm" before "m"). */
const STORED_UNITS = [...new Set(Object.values(QUANTITIES).map((q) => q.si))].sort((a, b) => b.length - a.length);
/** A figure ("82.1 mm"), or a range of them ("−100 to 100 mm"), with its unit when it has one; never inside a word ("link1"). */
const FIGURE = new RegExp(
  String.raw`(?<![\w.])(${NUMBER})(?:(\s+to\s+)(${NUMBER}))?(?:\s*(${STORED_UNITS.map((s) => s.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')).join('|')})(?![\w/²·(]))?`,
  'g',
);

/**
 * The figures of a message through the one formatter: a figure in a stored unit that the user's unit system
 * writes otherwise (mm, N, km/h, … for an inch/pound user) converted with its quantity's precision, and any other
 * unrounded figure (four decimals or more) to 4 significant figures; the rest as the engine wrote it.
 */
function figuresIn(message: string, units: DisplayUnits): string {
  const value = (t: string) => Number(t.replace(/−/g, '-'));
  return message.replace(FIGURE, (all, a: string, to: string | undefined, b: string | undefined, unit: string | undefined) => {
    const kind = unit ? kindForUnit(unit) : null;
    if (kind && unitLabel(kind, units) !== unit) {
      const shown = (t: string) => formatNum(value(t), { kind }, units);
      return `${shown(a)}${to !== undefined && b !== undefined ? `${to}${shown(b)}` : ''} ${unitLabel(kind, units)}`;
    }
    return all.replace(/[−-]?\d+\.\d{4,}(?:e[−-]?\d+)?/g, (t) => formatNum(value(t), { sig: 4 }));
  });
}

/** A link's name without the point keys in brackets: "tie rod (tieRodInner–tieRodOuter)" → "tie rod". */
function plainLink(link: string): string {
  return link.replace(/\s*\([A-Za-z0-9]+–[A-Za-z0-9]+\)/g, '').trim();
}

/** A message with point-key pairs dropped and "Invalid x: a.b.c:" prefixes removed. */
function plainText(message: string): string {
  return plainLink(message)
    .replace(/^Invalid [a-z ]+: /, '')
    .replace(/^[a-z][A-Za-z0-9]*(?:\.[A-Za-z0-9[\]]+)+: /, '');
}
