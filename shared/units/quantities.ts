import type { DisplayUnits } from '../api/accounts.js';

/**
 * What a number measures, for display in the user's unit system (account
 * setting: SI or inch/pound). The one quantity table: the app's screens
 * (through `core/format`), the server's exports and the review record read it. Values are stored in the SI-based unit named
 * here (the unit in the field's name: `travelMm`, `massKg`, …). Each kind
 * names the significant figures its figures are shown with by default.
 *
 * Extension point for per-quantity rounding and units on every screen:
 * add a kind here (its stored unit, its inch/pound unit with the exact
 * factor, its default significant figures) and write `value | num:{ kind }`
 * in the app or `formatNum(value, { kind }, units)` (shared/units/format.ts).
 * The factors are exact by definition (1 in = 25.4 mm, 1 lb = 0.45359237 kg,
 * 1 lbf = 4.4482216152605 N), the same inch/pound units the vehicle form's
 * mathjs table (shared/schema/units.ts, `IMPERIAL_UNITS`) converts to; the
 * pipe keeps its own factors so that formatting never loads mathjs.
 */
export interface QuantityUnits {
  /** Stored (SI-based) unit as written on screen. */
  readonly si: string;
  /** Inch/pound unit as written on screen; the same as `si` where none applies (angles). */
  readonly imperial: string;
  /** Inch/pound value = stored value × factor. */
  readonly factor: number;
  /** Stored value = inch/pound value × toStored (1 / factor, written from the exact definitions so a typed 0.1 in is 2.54 mm). */
  readonly toStored: number;
  /** Significant figures a figure of this kind is shown with unless the caller names a precision. */
  readonly sig: number;
}

const LBF_N = 4.4482216152605;
const IN_MM = 25.4;
const LB_KG = 0.45359237;
const FT_M = 0.3048;
const MI_KM = 1.609344;

export const QUANTITIES = {
  length: { si: 'mm', imperial: 'in', factor: 1 / IN_MM, toStored: IN_MM, sig: 4 },
  mass: { si: 'kg', imperial: 'lb', factor: 1 / LB_KG, toStored: LB_KG, sig: 4 },
  force: { si: 'N', imperial: 'lbf', factor: 1 / LBF_N, toStored: LBF_N, sig: 4 },
  angle: { si: 'deg', imperial: 'deg', factor: 1, toStored: 1, sig: 3 },
  linearRate: { si: 'N/mm', imperial: 'lbf/in', factor: IN_MM / LBF_N, toStored: LBF_N / IN_MM, sig: 4 },
  rollStiffness: { si: 'N·m/deg', imperial: 'lbf·ft/deg', factor: 1 / (LBF_N * FT_M), toStored: LBF_N * FT_M, sig: 4 },
  inertia: { si: 'kg·m²', imperial: 'lb·ft²', factor: 1 / (LB_KG * FT_M * FT_M), toStored: LB_KG * FT_M * FT_M, sig: 4 },
  understeerGradient: { si: 'deg/g', imperial: 'deg/g', factor: 1, toStored: 1, sig: 3 },
  rollSteer: { si: 'deg/deg', imperial: 'deg/deg', factor: 1, toStored: 1, sig: 3 },
  bumpSteer: { si: 'deg/m', imperial: 'deg/in', factor: IN_MM / 1000, toStored: 1000 / IN_MM, sig: 3 },
  /** Camber change per length of wheel travel (the same units as bump steer). */
  camberGain: { si: 'deg/m', imperial: 'deg/in', factor: IN_MM / 1000, toStored: 1000 / IN_MM, sig: 3 },
  /** Second-order term of a toe or camber curve against travel. */
  curvature: { si: 'deg/m²', imperial: 'deg/in²', factor: (IN_MM / 1000) ** 2, toStored: (1000 / IN_MM) ** 2, sig: 3 },
  /** Vehicle speed (1 mi = 1.609344 km exactly). */
  speed: { si: 'km/h', imperial: 'mph', factor: 1 / MI_KM, toStored: MI_KM, sig: 4 },
  /** Distances on the road: a corner radius, the drift after a bump. */
  distance: { si: 'm', imperial: 'ft', factor: 1 / FT_M, toStored: FT_M, sig: 4 },
  /** Lateral load transfer per g of lateral acceleration. */
  forcePerG: { si: 'N/g', imperial: 'lbf/g', factor: 1 / LBF_N, toStored: LBF_N, sig: 4 },
  /** Compliance steer or camber per force (1 klbf = 4.4482216152605 kN). */
  anglePerForce: { si: 'deg/kN', imperial: 'deg/klbf', factor: LBF_N, toStored: 1 / LBF_N, sig: 3 },
  /** Compliance steer per moment (1 klbf·ft = 4.4482216152605 kN × 0.3048 m). */
  anglePerMoment: { si: 'deg/(kN·m)', imperial: 'deg/(klbf·ft)', factor: LBF_N * FT_M, toStored: 1 / (LBF_N * FT_M), sig: 3 },
  /** Roll moment per g of lateral acceleration. */
  momentPerG: { si: 'N·m/g', imperial: 'lbf·ft/g', factor: 1 / (LBF_N * FT_M), toStored: LBF_N * FT_M, sig: 4 },
  /** Tyre cornering stiffness: lateral force per degree of slip (1 lbf = 4.4482216152605 N). */
  corneringStiffness: { si: 'N/deg', imperial: 'lbf/deg', factor: 1 / LBF_N, toStored: LBF_N, sig: 4 },
  /**
   * Tyre load sensitivity b of C = a·Fz − b·Fz² (per tyre): cornering stiffness per degree lost per force
   * squared, 1/(deg·N); in inch/pound with Fz in lbf, 1/(deg·lbf) = 1/(deg·N) × 4.4482216152605.
   */
  loadSensitivityB: { si: '1/(deg·N)', imperial: '1/(deg·lbf)', factor: LBF_N, toStored: 1 / LBF_N, sig: 4 },
  /** Damper rate at the wheel: force per wheel velocity (1 lbf·s/in = 4.4482216152605 N·s / 25.4 mm). */
  dampingRate: { si: 'N·s/mm', imperial: 'lbf·s/in', factor: IN_MM / LBF_N, toStored: LBF_N / IN_MM, sig: 4 },
  /** Roll damping of the suspension: moment per roll rate. */
  rollDamping: { si: 'N·m·s/deg', imperial: 'lbf·ft·s/deg', factor: 1 / (LBF_N * FT_M), toStored: LBF_N * FT_M, sig: 4 },
  /** Shear modulus of a bar's steel (1 psi = 4.4482216152605 N / 0.0254² m² = 6894.757… Pa). */
  shearModulus: { si: 'GPa', imperial: 'psi', factor: (1e9 * (IN_MM / 1000) ** 2) / LBF_N, toStored: LBF_N / (1e9 * (IN_MM / 1000) ** 2), sig: 4 },
  /** Anti-roll bar twist per length of wheel travel. */
  twistPerLength: { si: 'rad/m', imperial: 'rad/in', factor: IN_MM / 1000, toStored: 1000 / IN_MM, sig: 4 },
} as const satisfies Record<string, QuantityUnits>;

export type QuantityKind = keyof typeof QUANTITIES;

/** A stored value in the chosen unit system. */
export function inDisplayUnits(value: number, kind: QuantityKind, units: DisplayUnits): number {
  return units === 'imperial' ? value * QUANTITIES[kind].factor : value;
}

/** A value typed in the user's unit system as the stored (SI-based) value: the inverse of inDisplayUnits. */
export function fromDisplayUnits(value: number, kind: QuantityKind, units: DisplayUnits): number {
  return units === 'imperial' ? value * QUANTITIES[kind].toStored : value;
}

/** The unit a value of this kind is shown in, e.g. unitLabel('length', 'imperial') = 'in'. */
export function unitLabel(kind: QuantityKind, units: DisplayUnits): string {
  return QUANTITIES[kind][units];
}

/**
 * Decimals for a figure shown to `siDecimals` in its stored unit, in the
 * chosen system: as many more as the conversion shrinks the number by powers
 * of ten (deg/m to 2 decimals is deg/in to 4), so the resolution shown stays
 * the same in either system.
 */
export function displayDecimals(kind: QuantityKind, units: DisplayUnits, siDecimals: number): number {
  if (units === 'si') return siDecimals;
  return Math.max(0, siDecimals + Math.round(Math.log10(1 / QUANTITIES[kind].factor)));
}

/**
 * The kind whose stored unit is `siUnit` as written ('mm', 'deg/m', 'deg/g'),
 * for figures that arrive with their unit as text (study outputs, document
 * paths); null for a unit no kind converts ('%', 'deg/s'), shown as it is.
 * Where two kinds share a unit (bump steer and camber gain, deg/m) they
 * convert alike, and the first listed is taken.
 */
export function kindForUnit(siUnit: string): QuantityKind | null {
  for (const [kind, q] of Object.entries(QUANTITIES) as [QuantityKind, QuantityUnits][]) if (q.si === siUnit) return kind;
  return null;
}
