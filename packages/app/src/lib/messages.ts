/**
 * Messages as a person reads them: one sentence in the trade's words, naming the field by the label
 * the screen gives it and the bound with its unit ("Coefficient width must be at least 2 bits."),
 * never the raw path twice ("password: password: …") or a path for a secret ("token: …").
 */
import { SPEC_SECTIONS, fieldAt, type FieldDef } from '../form/specFields.ts';
import { fmtEng } from './format.ts';

/** Labels of request fields that are not spec fields; "" for a field a person never types (a link's token). */
const REQUEST_LABELS: Readonly<Record<string, string>> = {
  email: 'E-mail',
  displayName: 'Name',
  token: '',
  baseRevision: '',
  reviewerIds: 'Reviewers',
};

/** Units a bound is not written with: no unit, or one that is a range or an identifier. */
const NO_UNIT = new Set(['', '—', 'id', 'FS', '1–4']);

/** "newPassword" → "New password"; "spec.filter.tau1S" → the form's label "τ1". */
export function labelOf(field: string): { label: string; unit: string } {
  // The API names a spec field under the request part it came in: spec.<path> (JSON) or file.<path> (an uploaded spec).
  const specPath = field.replace(/^(spec|file)\./, '');
  const def = fieldAt(specPath);
  if (def) return { label: def.label, unit: def.unit };
  const last = field.split('.').pop() ?? field;
  if (last in REQUEST_LABELS) return { label: REQUEST_LABELS[last]!, unit: '' };
  return { label: humanise(last), unit: '' };
}

/** "baseRevision" → "Base revision": a record's key in words. */
export function humanise(key: string): string {
  const words = key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Capital first letter, full stop at the end (unless it ends in one already). */
export function asSentence(text: string): string {
  const t = text.trim();
  if (t === '') return t;
  // Latin letters only: a leading symbol (τ1, ζ) keeps its case.
  const capital = /^[a-z]/.test(t) ? t.charAt(0).toUpperCase() + t.slice(1) : t;
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}

/** Drops every leading "path: " the layers below put in front (the field is named once, by label). */
function withoutPathPrefixes(field: string, message: string): string {
  const paths = new Set([field, field.replace(/^(spec|file)\./, ''), field.split('.').pop() ?? field].filter((p) => p !== ''));
  let m = message.trim();
  for (let changed = true; changed; ) {
    changed = false;
    for (const p of paths) {
      if (m.startsWith(`${p}: `)) {
        m = m.slice(p.length + 2).trim();
        changed = true;
      }
    }
  }
  return m;
}

const SPEC_FIELDS: readonly FieldDef[] = SPEC_SECTIONS.flatMap((s) => s.fields);

/** Spec paths a message may name, longest first: every full path, and each last segment that only one field has. */
const PATH_NAMES: readonly [string, FieldDef][] = (() => {
  const bySegment = new Map<string, FieldDef[]>();
  for (const f of SPEC_FIELDS) {
    const seg = f.path.split('.').pop()!;
    bySegment.set(seg, [...(bySegment.get(seg) ?? []), f]);
  }
  const names: [string, FieldDef][] = SPEC_FIELDS.map((f) => [f.path, f]);
  for (const [seg, fields] of bySegment) if (fields.length === 1 && seg !== fields[0]!.path && /[A-Z]/.test(seg)) names.push([seg, fields[0]!]);
  return names.sort((a, b) => b[0].length - a[0].length);
})();

/** "Loop update rate" → "loop update rate" inside a sentence; "NCO gain" keeps its capitals. */
function inSentence(label: string): string {
  return /^[A-Z][a-z]/.test(label) ? label.charAt(0).toLowerCase() + label.slice(1) : label;
}

function valueWithUnit(text: string, unit: string): string {
  const v = Number(text);
  if (unit === 'Hz' || unit === 's') return fmtEng(v, unit, 6);
  return NO_UNIT.has(unit) ? text : `${text} ${unit}`;
}

/**
 * Spec paths inside a message become the form's labels, and a value after a path gets its unit:
 * "sampleRateHz 2000000 exceeds clockHz 1000000" → "loop update rate (2 MHz) exceeds fabric clock (1 MHz)".
 */
export function namePaths(message: string): string {
  let m = message.replace(/\bsampleRateHz\/2\b/g, 'half the loop update rate');
  for (const [name, def] of PATH_NAMES) {
    const escaped = name.replace(/\./g, '\\.');
    m = m.replace(new RegExp(`(?<![\\w.])${escaped}(?![\\w])( -?\\d+(?:\\.\\d+)?(?:e[+-]?\\d+)?)?`, 'g'), (_all, value: string | undefined) =>
      value ? `${inSentence(def.label)} (${valueWithUnit(value.trim(), def.unit)})` : inSentence(def.label),
    );
  }
  return m;
}

/**
 * One sentence for a message about a field: "Coefficient width must be at least 2 bits.",
 * "Natural frequency is empty: enter a number.", "E-mail: no account has this address.".
 */
export function fieldMessage(field: string, message: string, shown?: { readonly label: string; readonly unit: string }): string {
  // A label's parenthetical hint ("Input SNR (blank: no noise)") is for the field, not the sentence.
  const { label, unit } = shown ? { label: shown.label.replace(/ \(.*\)$/, ''), unit: shown.unit } : labelOf(field);
  let m = namePaths(withoutPathPrefixes(field, message).replace(/^missing \(expected (.+)\)$/, 'is empty: enter $1'));
  // A message that opens by naming its own field ("loop update rate (2 MHz) exceeds …") names it once.
  if (label !== '' && m.toLowerCase().startsWith(label.toLowerCase())) return asSentence(m);
  // The degree sign follows its number directly ("360°"); other units after a space.
  if (!NO_UNIT.has(unit)) m = m.replace(/\b(at least|at most|above|below) (-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)$/, `$1 $2${unit === '°' ? '' : ' '}${unit}`);
  if (label === '') return asSentence(m);
  if (/^(must|is|are|needs|has|cannot|should)\b/.test(m)) return asSentence(`${label} ${m}`);
  return asSentence(`${label}: ${m}`);
}
