/**
 * A corner's inputs that are not hardpoint positions, in words: what the
 * spring, pushrod and drop link ride on, whether and by what the corner is
 * steered, the toe link of a five-link corner, and every mount that may carry
 * a compliance rate (rigid where the document has none). The editor's panels
 * offer them from here, and the design report and the configuration review
 * record list them (`cornerInputRows`), so screen and paper name them alike.
 * Presentation only: no engineering here; figures stay in stored units.
 */
import type { Corner } from '../schema/corner.js';
import { BUSHING_POINTS, STIFF_LINKS, attachmentIssue, type Attachment } from '../schema/corner-rules.js';
import type { QuantityKind } from '../units/quantities.js';
import { pointName } from './hardpoint-points.js';

/** A steering definition of the corner document: a rack or a steering-box arm. */
export type Steering = NonNullable<Corner['steering']>;
export type SteeringKind = Steering['kind'];

/** A steering kind in words, in the order they are offered. */
export const STEERING_KIND_WORDS: Readonly<Record<SteeringKind, string>> = { rack: 'Steering rack', arm: 'Steering-box arm' };

// ---------- choices: what a spring, pushrod or drop link rides on, the toe link, steered ----------

/** An attachment in words, in the order they are offered. */
export const ATTACHMENT_WORDS: Readonly<Record<Attachment, string>> = { upright: 'Upright', lowerArm: 'Lower arm', upperArm: 'Upper arm' };
const ATTACHMENT_ORDER = Object.keys(ATTACHMENT_WORDS) as Attachment[];

/** What one body-mounted part's outer end rides on, with the choices the corner type allows (the corner rules say which). */
export interface AttachmentField {
  readonly path: string;
  readonly label: string;
  readonly value: Attachment;
  readonly options: readonly Attachment[];
}

/** The corner's attachments: the spring's (or pushrod's) outer end and the anti-roll bar's drop link, where it has them. */
export function cornerAttachments(corner: Corner): AttachmentField[] {
  const field = (path: string, label: string, value: Attachment): AttachmentField => ({
    path,
    label,
    value,
    options: ATTACHMENT_ORDER.filter((a) => a === value || attachmentIssue(corner.type, path, a) === null),
  });
  const out: AttachmentField[] = [];
  const sp = corner.spring;
  if (sp?.kind === 'direct') out.push(field('spring.springOuterOn', 'Spring, suspension end rides on', sp.springOuterOn));
  if (sp?.kind === 'rocker') out.push(field('spring.rodOuterOn', 'Push/pull rod, outer end rides on', sp.rodOuterOn));
  if (corner.antiRollBar) out.push(field('antiRollBar.dropLinkOuterOn', 'Anti-roll bar drop link, suspension end rides on', corner.antiRollBar.dropLinkOuterOn));
  return out;
}

// ---------- compliance rates ----------

/** One rate of a mount: its key inside the mount (null when the mount is one number) and its value, N/mm (undefined: rigid). */
export interface MountRate {
  readonly key: string | null;
  readonly label: string;
  readonly value: number | undefined;
}

/** A place that may be compliant: a bushing (radial and axial), a single link's own axial stiffness, the steering at the rack. */
export interface ComplianceMount {
  readonly path: string;
  readonly group: 'Bushings' | 'Links' | 'Steering';
  readonly label: string;
  readonly rates: readonly MountRate[];
}

const LINK_WORDS: Readonly<Record<string, string>> = { tieRod: 'Tie rod' };

/** Every mount of the corner that may carry a rate (shared/schema/corner-rules.ts says which, per corner type), rigid or not. */
export function complianceMounts(corner: Corner): ComplianceMount[] {
  const bushings = (corner.bushings ?? {}) as Readonly<Record<string, { radialNPerMm: number; axialNPerMm: number } | undefined>>;
  const links = (corner.linkAxialNPerMm ?? {}) as Readonly<Record<string, number | undefined>>;
  const out: ComplianceMount[] = BUSHING_POINTS[corner.type].map((name) => ({
    path: `bushings.${name}`,
    group: 'Bushings',
    label: pointName(`points.${name}`, corner),
    rates: [
      { key: 'radialNPerMm', label: 'Radial', value: bushings[name]?.radialNPerMm },
      { key: 'axialNPerMm', label: 'Axial', value: bushings[name]?.axialNPerMm },
    ],
  }));
  for (const link of STIFF_LINKS[corner.type]) {
    const n = /^link([1-5])$/.exec(link)?.[1];
    const label = n ? `Link ${n}${corner.type === 'five-link' && corner.toeLink === Number(n) ? ' (toe link)' : ''}` : link === 'tieRod' && !corner.steered ? 'Toe link' : (LINK_WORDS[link] ?? link);
    out.push({ path: `linkAxialNPerMm.${link}`, group: 'Links', label: `${label}, axial`, rates: [{ key: null, label: 'Axial', value: links[link] }] });
  }
  if (corner.steered || corner.steeringStiffnessNPerMm !== undefined) {
    out.push({ path: 'steeringStiffnessNPerMm', group: 'Steering', label: 'Steering at the rack, along its travel', rates: [{ key: null, label: 'Rate', value: corner.steeringStiffnessNPerMm }] });
  }
  return out;
}


// ---------- the inputs as listed in the reports ----------

/** One input of a corner as a report lists it: numbers in stored units (`kind` converts them; null: plain numbers), words, or rigid. */
export interface CornerInputRow {
  readonly group: 'Steering' | 'What the parts ride on' | 'Compliance';
  readonly label: string;
  readonly value: readonly number[] | string | { readonly rigid: true };
  /** The quantity of the numbers; null for a direction (only where it points counts) or for words. */
  readonly kind: QuantityKind | null;
}

/**
 * The corner's steering, attachments and compliance as rows for a report (the design report, the configuration
 * review record): steered or a fixed toe link, the steering's kind, stroke and axis, the five-link toe link, what
 * each body-mounted part rides on, then every mount that may carry a rate, "rigid" where the document gives none.
 */
export function cornerInputRows(corner: Corner): CornerInputRow[] {
  const rows: CornerInputRow[] = [];
  const add = (group: CornerInputRow['group'], label: string, value: CornerInputRow['value'], kind: QuantityKind | null = null) => rows.push({ group, label, value, kind });
  add('Steering', 'Steered', corner.steered ? 'yes' : 'no: a fixed toe link');
  const st = corner.steered ? corner.steering : undefined;
  if (st) add('Steering', 'Steered by', STEERING_KIND_WORDS[st.kind].toLowerCase());
  if (st?.kind === 'rack') {
    add('Steering', 'Rack stroke (toward the right, toward the left)', st.rackStroke, 'length');
    add('Steering', 'Rack axis direction (x, y, z)', st.rackAxis);
  } else if (st?.kind === 'arm') {
    add('Steering', 'Arm stroke (one end, other end)', st.angularStrokeDeg, 'angle');
    add('Steering', 'Arm pivot point (x, y, z)', st.armAxisPoint, 'length');
    add('Steering', 'Arm axis direction (x, y, z)', st.armAxisDirection);
  }
  if (corner.type === 'five-link') add('Steering', 'Toe link', `link ${corner.toeLink}`);
  for (const f of cornerAttachments(corner)) add('What the parts ride on', f.label, ATTACHMENT_WORDS[f.value].toLowerCase());
  for (const m of complianceMounts(corner)) {
    const what = m.group === 'Bushings' ? `Bushing, ${m.label} (${m.rates.map((r) => r.label.toLowerCase()).join(', ')})` : m.group === 'Links' ? `Link rate, ${m.label}` : `Steering rate, ${m.label.toLowerCase()}`;
    const values = m.rates.map((r) => r.value);
    add('Compliance', what, values.every((v): v is number => v !== undefined) ? values : { rigid: true }, 'linearRate');
  }
  return rows;
}
