import { wordNumber } from '../../../shared/schema/issue-words';
import type { AnalysisFailure } from './analysis-types';
import type { DisplayUnits } from '../core/api-types';
import { inDisplayUnits, unitLabel } from '../core/format/quantities';

/**
 * An engine failure in the user's words, for the editor and the intent panel:
 * where the linkage stopped (travel as bump or droop, the rack), which link
 * could not close in the trade's words, numbers rounded; never a document key
 * (`trackProfile.travelMm`), a point-key pair (`rodOuter–rodRocker`) or an
 * unrounded figure. Lengths are written in the user's unit system.
 */
export function failureWords(f: AnalysisFailure, units: DisplayUnits = 'si'): string {
  const n = (mm: number) => wordNumber(inDisplayUnits(mm, 'length', units));
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
  return lengthsIn(plainText(f.message), units);
}

/** Lengths in mm within a message ("at travel 82.1 mm") in the user's unit system. */
function lengthsIn(message: string, units: DisplayUnits): string {
  if (units === 'si') return message;
  return message.replace(/([−-]?\d+(?:\.\d+)?)\s*mm\b/g, (_all, v: string) => `${wordNumber(inDisplayUnits(Number(v.replace('−', '-')), 'length', units))} ${unitLabel('length', units)}`);
}

/** A link's name without the point keys in brackets: "tie rod (tieRodInner–tieRodOuter)" → "tie rod". */
function plainLink(link: string): string {
  return link.replace(/\s*\([A-Za-z0-9]+–[A-Za-z0-9]+\)/g, '').trim();
}

/** A message with point-key pairs dropped, "Invalid x: a.b.c:" prefixes removed and long decimals rounded. */
function plainText(message: string): string {
  return plainLink(message)
    .replace(/^Invalid [a-z ]+: /, '')
    .replace(/^[a-z][A-Za-z0-9]*(?:\.[A-Za-z0-9[\]]+)+: /, '')
    .replace(/-?\d+\.\d{4,}/g, (n) => wordNumber(Number(n)));
}

