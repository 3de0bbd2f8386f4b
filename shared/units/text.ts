/**
 * Figures inside a sentence in the reader's unit system. The engine, the
 * caution rules and the balance link write their sentences with stored SI
 * figures ("the corner's track (1209 mm) differs…", "−10 to +4 deg/m"); a
 * screen shows them through `figuresInUnits`, which rewrites each figure in
 * a stored unit that the reader's system writes otherwise (mm, N, N/deg,
 * km/h, deg/m, … for an inch/pound reader) with its quantity's precision,
 * ranges included ("−100 to 100 mm"), and rounds any other unrounded figure
 * (four decimals or more) to 4 significant figures. SI text is left as it is
 * apart from that rounding.
 */
import type { DisplayUnits } from '../api/accounts.js';
import { formatNum } from './format.js';
import { kindForUnit, QUANTITIES, unitLabel } from './quantities.js';

const NUMBER = String.raw`[−+-]?\d+(?:\.\d+)?(?:e[−-]?\d+)?`;
/** The stored units a sentence may carry a figure in, longest first ("mm" before "m", "N/deg" before "N"). */
const STORED_UNITS = [...new Set(Object.values(QUANTITIES).map((q) => q.si))].sort((a, b) => b.length - a.length);
/** A figure ("82.1 mm"), or a range of them ("−100 to 100 mm"), with its unit when it has one; never inside a word ("link1"). */
const FIGURE = new RegExp(
  String.raw`(?<![\w.])(${NUMBER})(?:(\s+to\s+)(${NUMBER}))?(?:\s*(${STORED_UNITS.map((s) => s.replace(/[.*+?^${}()|[\]\\/]/g, '\\$&')).join('|')})(?![\w/²·(]))?`,
  'g',
);

export function figuresInUnits(text: string, units: DisplayUnits): string {
  const value = (t: string) => Number(t.replace(/−/g, '-'));
  return text.replace(FIGURE, (all, a: string, to: string | undefined, b: string | undefined, unit: string | undefined) => {
    const kind = unit ? kindForUnit(unit) : null;
    if (kind && unitLabel(kind, units) !== unit) {
      // An explicit plus ("+4 deg/m") stays; a minus is the formatter's.
      const shown = (t: string) => (t.startsWith('+') ? '+' : '') + formatNum(value(t), { kind }, units);
      return `${shown(a)}${to !== undefined && b !== undefined ? `${to}${shown(b)}` : ''} ${unitLabel(kind, units)}`;
    }
    return all.replace(/[−-]?\d+\.\d{4,}(?:e[−-]?\d+)?/g, (t) => formatNum(value(t), { sig: 4 }));
  });
}
