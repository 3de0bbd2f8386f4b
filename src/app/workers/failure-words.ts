import { wordNumber } from '../../../shared/schema/issue-words';
import type { AnalysisFailure } from './analysis-types';

/**
 * An engine failure in the user's words, for the editor and the intent panel:
 * where the linkage stopped (travel as bump or droop, the rack), which link
 * could not close in the trade's words, numbers rounded; never a document key
 * (`trackProfile.travelMm`), a point-key pair (`rodOuter–rodRocker`) or an
 * unrounded figure.
 */
export function failureWords(f: AnalysisFailure): string {
  const d = (f.details && typeof f.details === 'object' ? f.details : {}) as Record<string, unknown>;
  const travel = typeof d['travelMm'] === 'number' ? d['travelMm'] : null;
  const rack = typeof d['rackMm'] === 'number' ? d['rackMm'] : null;
  if ((f.code === 'unreachable_pose' || f.code === 'no_convergence') && travel !== null) {
    const where = `${travel === 0 ? 'ride height' : `${wordNumber(Math.abs(travel))} mm of ${travel > 0 ? 'bump' : 'droop'}`}${rack ? ` with the rack at ${wordNumber(rack)} mm` : ''}${d['side'] === 'right' ? ' (right corner)' : ''}`;
    const link = typeof d['link'] === 'string' ? plainLink(d['link']) : null;
    const why = !link || link.startsWith('wheel-centre height') ? 'the travel is beyond what the links allow' : `the ${link} cannot reach`;
    const tr = Array.isArray(d['travelRangeMm']) ? (d['travelRangeMm'] as unknown[]).map(Number) : null;
    const range = tr ? ` Narrow the travel range (now ${wordNumber(tr[0]!)} to ${wordNumber(tr[1]!)} mm) to what the corner can reach.` : '';
    return `The linkage cannot reach ${where}: ${why}.${range}`;
  }
  return plainText(f.message);
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

