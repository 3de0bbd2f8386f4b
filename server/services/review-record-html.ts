/**
 * The configuration review record as one printable HTML document: the
 * layout for filing (A4, numbered sections, every page footed with the
 * configuration, revision and page count in the PDF). The app shows this
 * same document on its record page and prints it; the PDF is Chromium's
 * print of it (record-pdf.ts), so screen, paper and PDF are one layout.
 * Every value is escaped; nothing is loaded from outside the document.
 *
 * Figures are written in the reader's unit system (SI or inch-pound, issue 15
 * §2) through the one quantity table and formatter (shared/units), labelled
 * from the one result table (shared/io/result-words.ts); the record's data,
 * its JSON and the approval fingerprints stay SI.
 */
import { line, scaleLinear } from 'd3';
import { inputWords, resultWords } from '../../shared/io/result-words.js';
import { hardpointRows } from '../../shared/io/hardpoint-points.js';
import { cornerInputRows } from '../../shared/io/corner-inputs.js';
import type { Corner } from '../../shared/schema/corner.js';
import { displayDecimals, inDisplayUnits, kindForUnit, unitLabel, type QuantityKind } from '../../shared/units/quantities.js';
import { formatNum } from '../../shared/units/format.js';
import type { DisplayUnits } from '../../shared/api/accounts.js';
import { cautionFigures, figureUnits } from '../../shared/cautions/figures.js';
import { bumpCostWords } from '../../shared/ride/cost.js';
import type { ReviewRecordAnswer } from './review-record.js';
import type { AxleName } from '../../shared/schema/axle.js';

const esc = (v: unknown): string =>
  String(v ?? '').replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** A number rounded for reading: `digits` decimals, "–" when missing. */
function num(v: unknown, digits: number): string {
  return typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits).replace('-', '−') : '–';
}

/** How the record writes its figures in the reader's unit system. */
interface Figures {
  /** A stored value of `kind` shown to `siDecimals` decimals in SI (as many more as keep that resolution in inch-pound). */
  fixed(v: unknown, kind: QuantityKind, siDecimals: number): string;
  /** A stored value of `kind` to `sig` significant figures in the reader's units. */
  sig(v: unknown, kind: QuantityKind, sig: number): string;
  unit(kind: QuantityKind): string;
}

function figuresIn(units: DisplayUnits): Figures {
  const text = (v: unknown, write: (x: number) => string) => (typeof v === 'number' && Number.isFinite(v) ? write(v).replace('-', '−') : '–');
  return {
    fixed: (v, kind, d) => text(v, (x) => formatNum(x, { kind, decimals: displayDecimals(kind, units, d) }, units)),
    sig: (v, kind, sig) => text(v, (x) => formatNum(x, { kind, sig }, units)),
    unit: (kind) => unitLabel(kind, units),
  };
}

/** A measured caution figure with its stored unit ('mm', 'deg/m', '%'), in the reader's units where a quantity kind converts it. */
function cautionFigure(v: number | null | undefined, unit: string | null | undefined, f: Figures): string {
  if (v === null || v === undefined) return '–';
  const kind = unit ? kindForUnit(unit) : null;
  return kind ? `${f.fixed(v, kind, 3)} ${esc(f.unit(kind))}` : `${num(v, 3)} ${esc(unit ?? '')}`;
}

const UNIT_WORDS: Readonly<Record<DisplayUnits, string>> = {
  si: "SI (mm, kg, N, km/h; angles in deg), the reader's choice; the stored record and its fingerprints are SI",
  imperial: "Inch-pound (in, lb, lbf, mph; angles in deg), the reader's choice; the stored record and its fingerprints are SI",
};

/** Dates in UTC, ISO-like and unambiguous on paper whatever the reader's locale. */
function when(v: unknown): string {
  if (!v) return '–';
  const d = new Date(v as string);
  return Number.isNaN(d.getTime()) ? '–' : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

const STATUS_WORDS: Record<string, string> = {
  draft: 'Draft',
  in_review: 'In review',
  changes_requested: 'Returned for rework',
  approved: 'Signed off',
  released: 'Released to build',
  validated: 'Validated',
};
export const statusWords = (s: string): string => STATUS_WORDS[s] ?? s;

/** Every numeric or text leaf of a document with its path, for the input tables. */
function leaves(doc: unknown, prefix: string, out: { path: string; value: unknown }[] = []): { path: string; value: unknown }[] {
  if (doc === null || doc === undefined) return out;
  if (Array.isArray(doc) && doc.every((x) => typeof x === 'number')) {
    out.push({ path: prefix, value: doc });
    return out;
  }
  if (typeof doc === 'object') {
    for (const [k, v] of Object.entries(doc as Record<string, unknown>)) leaves(v, Array.isArray(doc) ? `${prefix}[${k}]` : prefix ? `${prefix}.${k}` : k, out);
    return out;
  }
  out.push({ path: prefix, value: doc });
  return out;
}

/**
 * The inputs as entered, to 6 significant figures in the reader's units; hardpoints to 0.1 mm (or the same
 * resolution in inches), named as the hardpoint table names them (shared/io/hardpoint-points.ts) when `corner` is the document.
 */
function inputTable(title: string, top: string, doc: unknown, f: Figures, corner?: Corner): string {
  const pointNames = new Map(corner ? hardpointRows(corner).map((h) => [`${top}.${h.key}`, h.name]) : []);
  const rows = leaves(doc, top)
    .filter((r) => !r.path.endsWith('formatVersion') && !(corner && LISTED_APART.test(r.path.slice(top.length + 1))))
    .map((r) => {
      const w = inputWords(r.path);
      const point = Array.isArray(r.value) ? pointNames.get(r.path) : undefined;
      const label = point ?? w.label.replace(/^[^·]+· /, '');
      const plain = (x: number) => String(Number(x.toPrecision(w.sig ?? 6))).replace('-', '−');
      // A hardpoint is a length triple; another tuple (a stroke, an axis direction) is its own quantity, or plain numbers.
      const value = point
        ? (r.value as number[]).map((x) => f.fixed(x, 'length', 1)).join(', ')
        : Array.isArray(r.value)
          ? (r.value as number[]).map((x) => (w.kind ? f.sig(x, w.kind, 6) : plain(x))).join(', ')
          : typeof r.value === 'number'
            ? w.kind
              ? f.sig(r.value, w.kind, 6)
              : plain(r.value)
            : esc(r.value);
      const unit = point ? `${f.unit('length')} (x, y, z)` : w.kind ? f.unit(w.kind) : (w.unit ?? '');
      return `<tr><th scope="row">${esc(label)}</th><td class="num">${value}</td><td>${esc(unit)}</td></tr>`;
    })
    .join('');
  return `<table class="inputs"><caption>${esc(title)}</caption><thead><tr><th scope="col">Input</th><th scope="col">Value</th><th scope="col">Unit</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** Corner keys the steering, attachments and compliance table lists in words (cornerInputTable), left out of the plain list. */
const LISTED_APART = /^(steered|steering\.|toeLink|spring\.\w+On$|antiRollBar\.dropLinkOuterOn|bushings\.|linkAxialNPerMm\.|steeringStiffnessNPerMm)/;

/**
 * A corner's steering (steered or a fixed toe link, the rack or arm with its stroke and axis), the five-link toe link,
 * what each part rides on and every compliance rate, "rigid" where none is given (shared/io/corner-inputs.ts), as the
 * design report lists them; numbers to 6 significant figures in the reader's units.
 */
function cornerInputTable(title: string, corner: Corner, f: Figures): string {
  let group = '';
  const rows = cornerInputRows(corner)
    .map((r) => {
      const head = r.group === group ? '' : `<tr><th scope="colgroup" colspan="3">${esc(r.group)}</th></tr>`;
      group = r.group;
      const rigid = typeof r.value !== 'string' && 'rigid' in r.value;
      const value =
        typeof r.value === 'string' ? esc(r.value) : 'rigid' in r.value ? 'rigid' : r.value.map((x) => (r.kind ? f.sig(x, r.kind, 6) : String(Number(x.toPrecision(6))).replace('-', '−'))).join(', ');
      return `${head}<tr><th scope="row">${esc(r.label)}</th><td class="num">${value}</td><td>${r.kind && !rigid ? esc(f.unit(r.kind)) : ''}</td></tr>`;
    })
    .join('');
  return `<table class="inputs"><caption>${esc(title)}</caption><thead><tr><th scope="col">Input</th><th scope="col">Value</th><th scope="col">Unit</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** Toe or camber against travel for both axles, drawn with scales and labelled axes (travel already in `travelUnit`). */
function curveSvg(title: string, unit: string, travelUnit: string, series: { name: string; dash: string; points: { x: number; y: number }[] }[]): string {
  const w = 320;
  const h = 200;
  const m = { l: 52, r: 12, t: 26, b: 36 };
  const xs = series.flatMap((s) => s.points.map((p) => p.x));
  const ys = series.flatMap((s) => s.points.map((p) => p.y));
  if (!xs.length) return `<p>${esc(title)}: no curve (the corner could not be swept).</p>`;
  const x = scaleLinear()
    .domain([Math.min(...xs), Math.max(...xs)])
    .range([m.l, w - m.r]);
  const y = scaleLinear()
    .domain([Math.min(...ys), Math.max(...ys)])
    .nice()
    .range([h - m.b, m.t]);
  const path = line<{ x: number; y: number }>()
    .x((p) => x(p.x))
    .y((p) => y(p.y));
  const xTicks = x.ticks(5).map((t) => `<g transform="translate(${x(t)},${h - m.b})"><line y2="4"/><text y="15" text-anchor="middle">${esc(x.tickFormat(5)(t)).replace('-', '−')}</text></g>`);
  const yTicks = y.ticks(5).map((t) => `<g transform="translate(${m.l},${y(t)})"><line x2="-4"/><line class="grid" x2="${w - m.l - m.r}"/><text x="-6" dy="0.32em" text-anchor="end">${esc(y.tickFormat(5)(t)).replace('-', '−')}</text></g>`);
  const lines = series.map((s) => `<path d="${path(s.points) ?? ''}" class="curve" stroke-dasharray="${s.dash}"/>`).join('');
  const legend = series.map((s, i) => `<g transform="translate(${m.l + 8 + i * 90},9)"><line x2="22" class="curve" stroke-dasharray="${s.dash}"/><text x="26" dy="0.32em">${esc(s.name)}</text></g>`).join('');
  return `<figure class="curve-figure"><svg viewBox="0 0 ${w} ${h}" role="img" aria-label="${esc(title)}"><g class="axis">${xTicks.join('')}${yTicks.join('')}<line x1="${m.l}" x2="${w - m.r}" y1="${h - m.b}" y2="${h - m.b}"/><line x1="${m.l}" x2="${m.l}" y1="${m.t}" y2="${h - m.b}"/></g>${lines}${legend}<text class="axis-title" x="${(m.l + w - m.r) / 2}" y="${h - 4}" text-anchor="middle">Wheel travel, ${esc(travelUnit)} (bump +)</text><text class="axis-title" transform="translate(12,${(m.t + h - m.b) / 2}) rotate(-90)" text-anchor="middle">${esc(unit)}</text></svg><figcaption>${esc(title)}</figcaption></figure>`;
}

const AXLE = { front: 'Front', rear: 'Rear' } as const;

/** The record in the reader's unit system (`units`: their account's choice, or the one the request names). */
export function renderReviewRecordHtml(r: ReviewRecordAnswer, units: DisplayUnits = 'si'): string {
  const f = figuresIn(units);
  /** The bump-cost sentence's figures in the reader's units (the caution messages come worded so from the record's computation). */
  const cautionWords = cautionFigures(figureUnits(units));
  const results = r.results as {
    balance: { understeerBudget: Record<string, number>; kinematicsLink?: Record<string, { used?: { rollSteerCoefficient?: number } }>; rollGradientDegPerG?: number; characteristicSpeedKph?: number | null };
    bumpSteer: Record<AxleName, { byRack?: { rackMm: number; bumpSteerDegPerM: number; camberGainDegPerM: number }[] }>;
  };
  const budget = results.balance.understeerBudget;
  const budgetRows = (['tyres', 'loadTransfer', 'rollSteer', 'rollCamber', 'complianceSteer', 'alignTorque', 'total'] as const)
    .map((k) => {
      const w = resultWords(`balance.understeerBudget.${k}`);
      const kind = w.kind ?? 'understeerGradient';
      return `<tr${k === 'total' ? ' class="total"' : ''}><th scope="row">${esc(w.label)}</th><td class="num">${f.fixed(budget[k], kind, 3)}</td><td>${esc(f.unit(kind))}</td></tr>`;
    })
    .join('');
  const axleFigures = (['front', 'rear'] as const)
    .map((axle) => {
      const fit = results.bumpSteer[axle]?.byRack?.find((b) => b.rackMm === 0);
      const eps = results.balance.kinematicsLink?.[axle]?.used?.rollSteerCoefficient;
      return `<tr><th scope="row">${AXLE[axle]}</th><td class="num">${f.fixed(eps, 'rollSteer', 4)}</td><td class="num">${f.fixed(fit?.bumpSteerDegPerM, 'bumpSteer', 2)}</td><td class="num">${f.fixed(fit?.camberGainDegPerM, 'camberGain', 1)}</td></tr>`;
    })
    .join('');
  const curves = (q: 'toeDeg' | 'camberDeg', title: string) =>
    curveSvg(title, q === 'toeDeg' ? 'Toe, deg (toe-in +)' : 'Camber, deg (top out +)', f.unit('length'), [
      { name: 'Front', dash: '', points: r.curves.front.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', units), y: p[q] })) },
      { name: 'Rear', dash: '5 3', points: r.curves.rear.map((p) => ({ x: inDisplayUnits(p.travelMm, 'length', units), y: p[q] })) },
    ]);
  const cautions = r.cautions
    .map((l) => {
      if (!l.ok) return `<h3>${AXLE[l.axle]} axle</h3><p class="critical">The cautions could not be measured: ${esc(l.failure.message)}</p>`;
      const rows = l.cautions
        .filter((c) => c.code !== 'safety-notice')
        .map((c) => `<tr class="level-${esc(c.level)}"><td>${esc(c.level === 'critical' ? 'Critical' : c.level === 'warning' ? 'Warning' : 'Note')}</td><td>${esc(c.message)}</td><td class="num">${cautionFigure(c.value, c.unit, f)}</td><td class="num">${cautionFigure(c.threshold, c.unit, f)}</td></tr>`)
        .join('');
      const cost = l.bumpCost ? `<p class="bump-cost"><strong>Bump cost:</strong> ${esc(bumpCostWords(l.bumpCost, l.axle, cautionWords))}</p>` : `<p class="bump-cost"><strong>Bump cost:</strong> not available${l.bumpCostUnavailable ? ` (${esc(l.bumpCostUnavailable)})` : ''}.</p>`;
      return `<h3>${AXLE[l.axle]} axle</h3>${cost}${rows ? `<table><thead><tr><th scope="col">Level</th><th scope="col">Caution</th><th scope="col">Measured</th><th scope="col">Threshold</th></tr></thead><tbody>${rows}</tbody></table>` : '<p>No cautions beyond the safety notice.</p>'}`;
    })
    .join('');
  const acks = r.acknowledgements.length
    ? `<table><thead><tr><th scope="col">Revision</th><th scope="col">Axle</th><th scope="col">Critical caution (as it read)</th><th scope="col">Reason given</th><th scope="col">By, when</th></tr></thead><tbody>${r.acknowledgements
        .map((a) => `<tr><td class="num">${a.revision}</td><td>${AXLE[a.axle]}</td><td>${esc(a.message)}</td><td>${esc(a.reason)}</td><td>${esc(a.acknowledgedByName ?? 'a former member')}, ${when(a.acknowledgedAt)}</td></tr>`)
        .join('')}</tbody></table>`
    : '<p>No Critical caution has been acknowledged for this configuration.</p>';
  const evidence = r.rig.axles
    .map((e) => {
      const rows = e.measurements
        .map((m) => `<tr><td>${esc(m.name)}</td><td>${esc(m.side)}, ${esc(m.basis)}</td><td class="num">${num(m.toeLargestDeg, 3)}</td><td class="num">${num(m.camberLargestDeg, 3)}</td><td>${m.within ? 'Within tolerance' : 'Outside tolerance'}</td><td>${esc(m.authorName ?? '–')}, ${when(m.createdAt)}</td></tr>`)
        .join('');
      return `<h3>${AXLE[e.axle]} axle (design revision ${e.designRevision})</h3>${rows ? `<table><thead><tr><th scope="col">Measurement</th><th scope="col">Side, basis</th><th scope="col">Largest toe difference, deg</th><th scope="col">Largest camber difference, deg</th><th scope="col">Verdict</th><th scope="col">By, when</th></tr></thead><tbody>${rows}</tbody></table>` : '<p>No rig measurement of this design revision.</p>'}`;
    })
    .join('');
  const waivers = r.waivers.length
    ? `<table><thead><tr><th scope="col">Revision</th><th scope="col">Axle</th><th scope="col">Reason for validating without rig evidence</th><th scope="col">By, when</th></tr></thead><tbody>${r.waivers
        .map((w) => `<tr><td class="num">${w.revision}</td><td>${AXLE[w.axle]}</td><td>${esc(w.reason)}</td><td>${esc(w.waivedByName ?? 'a former member')}, ${when(w.waivedAt)}</td></tr>`)
        .join('')}</tbody></table>`
    : '<p>No waiver of rig evidence.</p>';
  const history = r.history.length
    ? `<table><thead><tr><th scope="col">When</th><th scope="col">Revision</th><th scope="col">Step</th><th scope="col">By</th><th scope="col">Message</th></tr></thead><tbody>${r.history
        .map((h) => `<tr><td>${when(h.createdAt)}</td><td class="num">${h.revision}</td><td>${esc(statusWords(h.fromStatus))} → ${esc(statusWords(h.toStatus))}</td><td>${esc(h.actorName ?? 'a former member')}</td><td>${esc(h.message ?? '')}</td></tr>`)
        .join('')}</tbody></table>`
    : '<p>No review steps yet.</p>';
  const approvals = r.approvals.length
    ? `<table><thead><tr><th scope="col">Revision</th><th scope="col">Signed off by, when</th><th scope="col">Engine</th><th scope="col">Snapshot fingerprint (SHA-256)</th></tr></thead><tbody>${r.approvals
        .map((a) => `<tr><td class="num">${a.revision}</td><td>${esc(a.approvedByName ?? 'a former member')}, ${when(a.approvedAt)}</td><td>${esc(a.engineVersion)}</td><td class="fingerprint">${esc(a.fingerprint)}</td></tr>`)
        .join('')}</tbody></table>`
    : '<p>Not signed off yet: there is no approval snapshot.</p>';
  const ref = (x: { name: string | null; revision: number }, what: string) => `${esc(x.name ?? what)}, revision ${x.revision}`;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Review record: ${esc(r.configuration.name)}, revision ${r.revision.number}</title>
<style>${RECORD_CSS}</style></head>
<body><main class="record">
<header class="record-head">
  <p class="kicker">Configuration review record · ${esc(r.team.name)}</p>
  <h1>${esc(r.configuration.name)}, revision ${r.revision.number}</h1>
  <dl class="ident">
    <dt>Status</dt><dd>${esc(statusWords(r.configuration.status))}${r.configuration.currentRevision !== r.revision.number ? ` (current revision ${r.configuration.currentRevision})` : ''}</dd>
    <dt>Vehicle</dt><dd>${ref(r.refs.vehicle, 'vehicle')}</dd>
    <dt>Front axle design</dt><dd>${ref(r.refs.front, 'front design')}</dd>
    <dt>Rear axle design</dt><dd>${ref(r.refs.rear, 'rear design')}</dd>
    <dt>Track profile</dt><dd>${esc(r.trackProfile.label)} (travel ${f.fixed(r.trackProfile.travelMm[0], 'length', 0)} to ${f.fixed(r.trackProfile.travelMm[1], 'length', 0)} ${esc(f.unit('length'))})</dd>
    <dt>Revision written by</dt><dd>${esc(r.revision.authorName ?? '–')}, ${when(r.revision.createdAt)}${r.revision.message ? ` (“${esc(r.revision.message)}”)` : ''}</dd>
    <dt>Snapshot fingerprint</dt><dd class="fingerprint">${r.approval ? esc(r.approval.fingerprint) : 'none: this revision is not signed off'}</dd>
    <dt>Record made</dt><dd>${when(r.generatedAt)}, engine ${esc(r.engineVersion)}</dd>
    <dt>Filing reference</dt><dd>${esc(r.configuration.id)} / ${r.revision.number}</dd>
    <dt>Units</dt><dd data-units="${units}">${UNIT_WORDS[units]}</dd>
  </dl>
  <p class="safety" role="note"><strong>Safety:</strong> ${esc(r.safetyNotice)}</p>
</header>
<section><h2>1. Key results</h2>
  <table><thead><tr><th scope="col">Axle</th><th scope="col">Roll steer ε, ${esc(f.unit('rollSteer'))}</th><th scope="col">Bump steer, ${esc(f.unit('bumpSteer'))}</th><th scope="col">Camber gain, ${esc(f.unit('camberGain'))}</th></tr></thead><tbody>${axleFigures}</tbody></table>
  <h3>Understeer budget</h3>
  <table class="budget"><thead><tr><th scope="col">Term</th><th scope="col">Value</th><th scope="col">Unit</th></tr></thead><tbody>${budgetRows}</tbody></table>
</section>
<section class="curves"><h2>2. Curves over the profile's travel (rack straight ahead)</h2>
  <div class="figure-row">${curves('toeDeg', 'Toe against wheel travel')}${curves('camberDeg', 'Camber against wheel travel')}</div>
</section>
<section><h2>3. Bump cost and cautions</h2>${cautions}</section>
<section><h2>4. Critical cautions acknowledged at sign-off</h2>${acks}</section>
<section><h2>5. Rig evidence</h2>
  <p>Team rig tolerance: toe ${num(r.rig.tolerance.toeDeg, 2)}°, camber ${num(r.rig.tolerance.camberDeg, 2)}°${r.rig.tolerance.isDefault ? ' (product defaults)' : ''}.</p>
  ${evidence}
  <h3>Waivers</h3>${waivers}
</section>
<section><h2>6. Reviewers and dates</h2>${history}</section>
<section><h2>7. Approval snapshots</h2>${approvals}</section>
<section class="inputs-section"><h2>8. Inputs</h2>
  ${inputTable('Vehicle', 'vehicle', r.inputs.vehicle, f)}
  ${inputTable('Front corner', 'frontCorner', r.inputs.frontCorner, f, r.inputs.frontCorner)}
  ${cornerInputTable('Front corner: steering, attachments and compliance', r.inputs.frontCorner, f)}
  ${inputTable('Rear corner', 'rearCorner', r.inputs.rearCorner, f, r.inputs.rearCorner)}
  ${cornerInputTable('Rear corner: steering, attachments and compliance', r.inputs.rearCorner, f)}
</section>
<footer class="record-foot"><p class="safety" role="note"><strong>Safety:</strong> ${esc(r.safetyNotice)}</p></footer>
</main></body></html>`;
}

/** Screen and print in one sheet; the print part sets A4 pages, keeps tables and figures whole and drops colour fills that do not print. */
const RECORD_CSS = `
:root { color-scheme: light; --ink: #1d232b; --muted: #55606e; --rule: #b8c0ca; --critical: #7a1f3d; --warning: #6b4e00; }
* { box-sizing: border-box; }
body { margin: 0; font-family: 'Source Sans 3', 'Segoe UI', 'Helvetica Neue', Arial, sans-serif; color: var(--ink); font-size: 10.5pt; line-height: 1.35; background: #fff; }
.record { max-width: 190mm; margin: 0 auto; padding: 8mm 6mm; }
h1 { font-size: 17pt; margin: 0 0 3mm; }
h2 { font-size: 12.5pt; margin: 6mm 0 2mm; padding-bottom: 1mm; border-bottom: 1.5px solid var(--ink); }
h3 { font-size: 11pt; margin: 4mm 0 1.5mm; }
.kicker { margin: 0; color: var(--muted); text-transform: uppercase; letter-spacing: 0.06em; font-size: 8.5pt; }
dl.ident { display: grid; grid-template-columns: 42mm 1fr; gap: 0.8mm 4mm; margin: 0 0 3mm; }
dl.ident dt { color: var(--muted); }
dl.ident dd { margin: 0; }
.fingerprint { font-family: 'DejaVu Sans Mono', 'Consolas', monospace; font-size: 8pt; word-break: break-all; }
.safety { border: 1.5px solid var(--ink); padding: 2mm 3mm; margin: 3mm 0; }
table { border-collapse: collapse; width: 100%; margin: 1mm 0 3mm; font-size: 9.5pt; }
caption { text-align: left; font-weight: 600; padding: 1mm 0; }
th, td { border-bottom: 0.5px solid var(--rule); padding: 0.8mm 1.5mm; text-align: left; vertical-align: top; }
thead th { border-bottom: 1px solid var(--ink); font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
tr.total th, tr.total td { font-weight: 700; border-top: 1px solid var(--ink); }
tr.level-critical td:first-child, .critical { color: var(--critical); font-weight: 700; }
tr.level-warning td:first-child { color: var(--warning); font-weight: 600; }
.figure-row { display: flex; gap: 4mm; flex-wrap: wrap; }
.curve-figure { margin: 0; flex: 1 1 85mm; }
.curve-figure svg { width: 100%; height: auto; font-size: 9px; }
.curve-figure figcaption { font-size: 9pt; color: var(--muted); }
.axis line, .axis path { stroke: var(--ink); stroke-width: 0.6; fill: none; }
.axis line.grid { stroke: var(--rule); stroke-width: 0.4; }
.axis text, svg text { fill: var(--ink); }
.axis-title { font-size: 9px; }
.curve { stroke: var(--ink); stroke-width: 1.4; fill: none; }
table.inputs { font-size: 8.5pt; }
@page { size: A4; margin: 14mm 12mm 16mm; }
@media print {
  .record { max-width: none; padding: 0; }
  section, table, figure, .safety { break-inside: avoid-page; }
  table.inputs { break-inside: auto; }
  table.inputs tr { break-inside: avoid; }
  thead { display: table-header-group; }
  h2, h3 { break-after: avoid-page; }
  .inputs-section { break-before: page; }
}
`;
