import type { DisplayUnits } from '../api/accounts.js';
import { inDisplayUnits, QUANTITIES, type QuantityKind } from './quantities.js';

/**
 * How a number is written: to a fixed number of decimals (`{ decimals: 1 }`:
 * 12.3) or to significant figures (`{ sig: 3 }`: 0.0123, 123, 1.23e+6; trailing
 * zeros dropped), never both. With a `kind` the stored SI value is shown in
 * the user's unit system, and the kind's own significant figures apply when
 * no precision is named.
 */
export type NumFormat = (
  | { readonly decimals: number; readonly sig?: never }
  | { readonly sig: number; readonly decimals?: never }
  | { readonly decimals?: never; readonly sig?: never; readonly kind: QuantityKind }
) & {
  readonly kind?: QuantityKind;
  /** Text for a missing or non-finite value; an en dash unless named. */
  readonly missing?: string;
  /**
   * How the sign is written. Unset: as JavaScript writes it (hyphen-minus, for
   * text a reader may copy into a field). `'minus'`: a typographic minus (U+2212)
   * for tables and reports. `'change'`: a difference, `+` or `−` and `0` when it
   * rounds to nothing at the shown precision. A value that rounds to zero never
   * keeps a sign.
   */
  readonly sign?: 'minus' | 'change';
};

/** The one number formatter (the app's `num` pipe writes through it; the server's exports and records call it). */
export function formatNum(value: number | null | undefined, format: NumFormat, units: DisplayUnits = 'si'): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return format.missing ?? '–';
  const shown = format.kind ? inDisplayUnits(value, format.kind, units) : value;
  if (!format.sign) return magnitude(shown, format);
  const text = magnitude(Math.abs(shown), format);
  if (Number(text) === 0) return format.sign === 'change' ? '0' : text;
  return (shown < 0 ? '\u2212' : format.sign === 'change' ? '+' : '') + text;
}

function magnitude(shown: number, format: NumFormat): string {
  if (format.decimals !== undefined) return shown.toFixed(format.decimals);
  const sig = format.sig ?? (format.kind ? QUANTITIES[format.kind].sig : 6);
  return shown === 0 ? '0' : String(Number(shown.toPrecision(sig)));
}
