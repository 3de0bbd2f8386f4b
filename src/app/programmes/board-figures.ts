import { trackProfiles, type TrackProfileId } from '../../../shared/intent/profiles';
import type { ConfigurationStatus } from '../features/configurations/configurations-api';
import { STATUS_WORDS } from '../features/configurations/review-words';
import type { BoardRow, KeyFigures } from './programmes-api';

/** The key figures of the board, in the order shown, with units and shown digits. */
export const BOARD_FIGURES: readonly { key: keyof KeyFigures; label: string; unit: string; digits: number }[] = [
  { key: 'rollSteerFront', label: 'ε front', unit: 'deg/deg', digits: 3 },
  { key: 'rollSteerRear', label: 'ε rear', unit: 'deg/deg', digits: 3 },
  { key: 'rollSteerUndersteerDegPerG', label: 'Roll-steer understeer', unit: 'deg/g', digits: 3 },
  { key: 'understeerGradientDegPerG', label: 'Understeer gradient', unit: 'deg/g', digits: 3 },
  { key: 'bumpSteerFrontDegPerM', label: 'Bump steer front', unit: 'deg/m', digits: 2 },
  { key: 'bumpSteerRearDegPerM', label: 'Bump steer rear', unit: 'deg/m', digits: 2 },
];

/** A configuration's review status in words (the configuration screens' own words). */
export function statusWords(status: string): string {
  return status in STATUS_WORDS ? STATUS_WORDS[status as ConfigurationStatus].label : status;
}

export function profileLabel(id: string): string {
  return id in trackProfiles ? trackProfiles[id as TrackProfileId].label : id;
}

/** A figure to `digits` decimals with a real minus sign; a dash when missing. */
export function formatFigure(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = Math.abs(value).toFixed(digits);
  return (value < 0 && Number(text) !== 0 ? '−' : '') + text;
}

/**
 * latest − approved, in words that need no colour: "+0.012", "−0.004",
 * "no change" (equal at the shown digits), or a dash when either is missing.
 */
export function formatChange(latest: number | null | undefined, approved: number | null | undefined, digits: number): string {
  if (latest == null || approved == null || !Number.isFinite(latest) || !Number.isFinite(approved)) return '—';
  const d = latest - approved;
  const text = Math.abs(d).toFixed(digits);
  if (Number(text) === 0) return 'no change';
  return (d > 0 ? '+' : '−') + text;
}

export function latestFigures(row: BoardRow): KeyFigures | null {
  return 'figures' in row.latest ? row.latest.figures : null;
}

export function latestError(row: BoardRow): string | null {
  return 'error' in row.latest ? row.latest.error : null;
}
