import type { AnalysisFailure } from './analysis-types';
import type { DisplayUnits } from '../core/api-types';
import { formatNum } from '../core/format/num';
import { unitLabel } from '../core/format/quantities';
import { figuresInUnits } from '../../../shared/units/text';

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
  return figuresInUnits(plainText(f.message), units);
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
