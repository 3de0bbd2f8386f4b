/**
 * Document paths in words, with their units: `frontCorner.points.tieRodInner[2]`
 * → "Front corner · tie rod inner · z", mm. Used wherever a changed value is
 * shown to a person (the "use the latest revisions" preview, the review
 * record), so they read the same on screen and on paper. The unit comes
 * from the key's unit suffix (units live in names, DEVELOPERS.md);
 * hardpoint coordinates are mm (domain.md). Configuration results have their
 * own table (result-words.ts), which falls back on these words.
 * Presentation only: no engineering here.
 */

/** Key suffixes → unit, longest first so `NPerMm` wins over `Mm`. */
const SUFFIX_UNITS: readonly (readonly [string, string])[] = [
  ['NmsPerDeg', 'N·m·s/deg'],
  ['NmPerDeg', 'N·m/deg'],
  ['NsPerMm', 'N·s/mm'],
  ['NPerMm', 'N/mm'],
  ['NPerDeg', 'N/deg'],
  ['DegPerKN', 'deg/kN'],
  ['DegPerDeg', 'deg/deg'],
  ['DegPerG', 'deg/g'],
  ['DegPerM2', 'deg/m²'],
  ['DegPerM', 'deg/m'],
  ['RadPerM', 'rad/m'],
  ['PerS', '1/s'],
  ['KgM2', 'kg·m²'],
  ['Kph', 'km/h'],
  ['Deg', 'deg'],
  ['Mm', 'mm'],
  ['Kg', 'kg'],
  ['Pct', '%'],
  ['Hz', 'Hz'],
];

/**
 * Keys whose unit is not in their name, by their parent's key: the tyre's Cα = a·Fz − b·Fz²
 * (shared/schema/vehicle.ts), the wheel's loaded radius and the rack's stroke (shared/schema/corner.ts).
 */
const KEY_UNITS: Readonly<Record<string, string>> = {
  'loadSensitivity.a': '1/deg',
  'loadSensitivity.b': '1/(deg·N)',
  'wheel.radius': 'mm',
  'steering.rackStroke': 'mm',
  'steering.armAxisPoint': 'mm',
};

const TOP_WORDS: Readonly<Record<string, string>> = {
  vehicle: 'Vehicle',
  frontCorner: 'Front corner',
  rearCorner: 'Rear corner',
  trackProfile: 'Track profile',
  balance: 'Balance',
  bumpSteer: 'Bump steer',
};

const AXES = ['x', 'y', 'z'];

function stripUnit(key: string): { words: string; unit: string | null } {
  for (const [suffix, unit] of SUFFIX_UNITS) {
    if (key.length > suffix.length && key.endsWith(suffix)) return { words: key.slice(0, -suffix.length), unit };
  }
  return { words: key, unit: null };
}

/** camelCase → lower-case words ("tieRodInner" → "tie rod inner"). */
export function keyWords(key: string): string {
  return key
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/([A-Z])([A-Z][a-z])/g, '$1 $2')
    .toLowerCase();
}

/** A dotted document path in words with its unit (null when it has none, e.g. a name or a count). */
export function pathWords(path: string): { label: string; unit: string | null } {
  const parts = path.replace(/\[(\d+)\]/g, '.[$1]').split('.');
  const out: string[] = [];
  let unit: string | null = null;
  let inPoints = false;
  parts.forEach((p, i) => {
    const index = /^\[(\d+)\]$/.exec(p);
    if (index) {
      const n = Number(index[1]);
      // A hardpoint is [x, y, z] in mm.
      if (inPoints && n < 3) {
        out.push(AXES[n]!);
        unit = 'mm';
      } else out.push(`#${n + 1}`);
      return;
    }
    if (i === 0 && TOP_WORDS[p]) {
      out.push(TOP_WORDS[p]);
      return;
    }
    inPoints = p === 'points' || inPoints;
    if (p === 'points') return;
    const s = stripUnit(p);
    if (s.unit) unit = s.unit;
    const keyUnit = i > 0 ? KEY_UNITS[`${parts[i - 1]}.${p}`] : undefined;
    if (keyUnit) unit = keyUnit;
    out.push(keyWords(s.words));
  });
  return { label: out.join(' · '), unit };
}
