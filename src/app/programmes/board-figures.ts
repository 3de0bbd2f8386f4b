import { trackProfiles, type TrackProfileId } from '../../../shared/tracks/profiles';
import type { ConfigurationStatus } from '../features/configurations/configurations-api';
import { STATUS_WORDS } from '../features/configurations/review-words';
import type { BoardRow, KeyFigures } from './programmes-api';
import { formatNum } from '../core/format/num';
import { displayDecimals, inDisplayUnits, type QuantityKind, unitLabel } from '../core/format/quantities';
import type { DisplayUnits } from '../core/api-types';

export interface BoardFigure {
  readonly key: keyof KeyFigures;
  readonly label: string;
  /** What it measures: the stored unit and the user's (unitLabel). */
  readonly kind: QuantityKind;
  /** Decimals shown in the stored unit (displayDecimals gives them in the user's system). */
  readonly digits: number;
}

/** The key figures of the board, in the order shown, with what they measure and shown digits. */
export const BOARD_FIGURES: readonly BoardFigure[] = [
  { key: 'rollSteerFront', label: 'ε front', kind: 'rollSteer', digits: 3 },
  { key: 'rollSteerRear', label: 'ε rear', kind: 'rollSteer', digits: 3 },
  { key: 'rollSteerUndersteerDegPerG', label: 'Roll-steer understeer', kind: 'understeerGradient', digits: 3 },
  { key: 'understeerGradientDegPerG', label: 'Understeer gradient', kind: 'understeerGradient', digits: 3 },
  { key: 'bumpSteerFrontDegPerM', label: 'Bump steer front', kind: 'bumpSteer', digits: 2 },
  { key: 'bumpSteerRearDegPerM', label: 'Bump steer rear', kind: 'bumpSteer', digits: 2 },
];

/** A board figure's stored value in the user's unit system, with its unit and decimals there. */
export function boardFigureIn(f: BoardFigure, units: DisplayUnits): { unit: string; digits: number; convert: (v: number | null | undefined) => number | null } {
  return {
    unit: unitLabel(f.kind, units),
    digits: displayDecimals(f.kind, units, f.digits),
    convert: (v) => (v === null || v === undefined ? null : inDisplayUnits(v, f.kind, units)),
  };
}

/** A configuration's review status in words (the configuration screens' own words). */
export function statusWords(status: string): string {
  return status in STATUS_WORDS ? STATUS_WORDS[status as ConfigurationStatus].label : status;
}

export function profileLabel(id: string): string {
  return id in trackProfiles ? trackProfiles[id as TrackProfileId].label : id;
}

/** A figure to `digits` decimals with a real minus sign; a dash when missing. */
export function formatFigure(value: number | null | undefined, digits: number): string {
  return formatNum(value, { decimals: digits, sign: 'minus', missing: '—' });
}

/**
 * latest − approved, in words that need no colour: "+0.012", "−0.004",
 * "no change" (equal at the shown digits), or a dash when either is missing.
 */
export function formatChange(latest: number | null | undefined, approved: number | null | undefined, digits: number): string {
  if (latest == null || approved == null || !Number.isFinite(latest) || !Number.isFinite(approved)) return '—';
  const text = formatNum(latest - approved, { decimals: digits, sign: 'change' });
  return text === '0' ? 'no change' : text;
}

export function latestFigures(row: BoardRow): KeyFigures | null {
  return 'figures' in row.latest ? row.latest.figures : null;
}

export function latestError(row: BoardRow): string | null {
  return 'error' in row.latest ? row.latest.error : null;
}
