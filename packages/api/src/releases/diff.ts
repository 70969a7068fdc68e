/**
 * The difference between two releases of a design, in the words a reader uses: every generated
 * constant whose value differs, read from the manifests (which list every entry of the view-model the
 * templates render: word formats, widths and counts, integer codes, tables), then the spec fields and
 * the headline margins. Each figure of a side is a `Figure` (key, label, unit, value as text); a
 * section compares two lists of figures, so a new kind of figure is one more section builder.
 */
import { createHash } from 'node:crypto';
import type { DiffRow, DiffSection, ReleaseDiff } from '@loopwright/contract';
import type { Manifest } from '../render/artifacts.ts';

/** One figure of one release. */
export interface Figure {
  readonly key: string;
  readonly label: string;
  readonly unit: string;
  readonly value: string;
}

/** Leaf values of a JSON document by dot path (arrays by index). */
export function flatten(value: unknown, prefix = '', out = new Map<string, unknown>()): Map<string, unknown> {
  if (value !== null && typeof value === 'object') {
    const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value);
    if (entries.length === 0) out.set(prefix, value);
    for (const [key, v] of entries) flatten(v, prefix ? `${prefix}.${key}` : key, out);
  } else {
    out.set(prefix, value);
  }
  return out;
}

/** The rows where two lists of figures differ, in the order of the newer list (then what only the older has). */
export function changedFigures(before: readonly Figure[], after: readonly Figure[]): DiffRow[] {
  const a = new Map(before.map((f) => [f.key, f]));
  const b = new Map(after.map((f) => [f.key, f]));
  const keys = [...new Set([...b.keys(), ...a.keys()])];
  return keys.flatMap((key) => {
    const was = a.get(key);
    const is = b.get(key);
    if (was?.value === is?.value) return [];
    const named = (is ?? was)!;
    return [{ key, label: named.label, unit: named.unit, before: was?.value ?? null, after: is?.value ?? null }];
  });
}

/** What a manifest may lack: releases cut before formats and labels were recorded. */
type ManifestSide = Pick<Manifest, 'counts' | 'constants' | 'tables'> & Partial<Pick<Manifest, 'types'>>;

function tableValue(t: Manifest['tables'][number]): string {
  const sha = createHash('sha256').update(JSON.stringify(t.codes)).digest('hex').slice(0, 12);
  return `${t.codes.length} entries of ${t.widthBits} bits, SHA-256 ${sha}…`;
}

/** Every generated constant of a release by section, formats and widths first. */
export function constantFigures(m: ManifestSide): { formats: Figure[]; widths: Figure[]; codes: Figure[]; tables: Figure[] } {
  return {
    formats: (m.types ?? []).map((t) => ({ key: t.name, label: t.label, unit: '', value: t.format })),
    widths: m.counts.map((c) => ({ key: c.name, label: c.label ?? c.name, unit: c.unit ?? '', value: String(c.value) })),
    // The word's width is part of the value: the same code declared 20 bits wide is another literal.
    codes: m.constants.map((c) => ({ key: c.name, label: c.label ?? c.name, unit: '', value: `${c.code} (${c.signedness} ${c.widthBits} bits)` })),
    tables: m.tables.map((t) => ({ key: t.name, label: t.label ?? t.name, unit: '', value: tableValue(t) })),
  };
}

function plain(value: unknown): string {
  if (typeof value === 'string') return value;
  return value !== null && typeof value === 'object' ? JSON.stringify(value) : String(value);
}

/** Spec fields by dot path, values as entered; the app shows its form label for each path. */
export function specFigures(spec: unknown): Figure[] {
  return [...flatten(spec)].map(([key, value]) => ({ key, label: key, unit: '', value: plain(value) }));
}

const STAGES = [
  { key: 'analog', text: 'analog prototype' },
  { key: 'discrete', text: 'discrete loop' },
  { key: 'quantized', text: 'quantised loop' },
] as const;
const HEADLINE = [
  { key: 'crossoverHz', text: 'Gain crossover', unit: 'Hz' },
  { key: 'phaseMarginDeg', text: 'Phase margin', unit: 'deg' },
  { key: 'phaseCrossoverHz', text: 'Phase crossover', unit: 'Hz' },
  { key: 'gainMarginDb', text: 'Gain margin', unit: 'dB' },
] as const;

/** Four significant digits: a margin is read to a tenth of a degree, not to ten digits. */
function figure(value: unknown): string {
  return typeof value === 'number' && Number.isFinite(value) ? String(Number(value.toPrecision(4))) : 'none';
}

/** The headline margins of each stage (the lists of every crossing stay in the manifest). */
export function marginFigures(margins: unknown): Figure[] {
  const all = (margins ?? {}) as Record<string, Record<string, unknown> | null | undefined>;
  return STAGES.flatMap((stage) =>
    HEADLINE.map((h) => ({ key: `${stage.key}.${h.key}`, label: `${h.text}, ${stage.text}`, unit: h.unit, value: figure(all[stage.key]?.[h.key]) })),
  );
}

/** A measured figure as a reader compares it: the value, or the limit the search hit, with its bracket. */
function measuredValue(m: Record<string, unknown>): string {
  const pass = figure(m.passHz);
  const fail = m.failHz === null || m.failHz === undefined ? 'none failed' : figure(m.failHz);
  const bracket = `bracket ${pass} to ${fail}`;
  if (typeof m.valueHz === 'number') return `${figure(m.valueHz)} (${bracket})`;
  return m.limitedBy ? `not measured: ${String(m.limitedBy)} (${bracket})` : `none (${bracket})`;
}

/**
 * Each acquisition figure of the release (results.acquisition, dsp compareAcquisition), measured and
 * estimated; a release cut before the figures were stored has none, and the diff says so.
 */
export function acquisitionFigures(acquisition: unknown): Figure[] {
  const rows = ((acquisition ?? {}) as { figures?: readonly Record<string, unknown>[] }).figures;
  if (!rows) return [{ key: 'acquisition', label: 'Acquisition figures', unit: '', value: 'not stored in this release' }];
  return rows.flatMap((row) => {
    const name = String(row.name);
    const measured = (row.measured ?? {}) as Record<string, unknown>;
    const estimate = (row.estimate ?? {}) as Record<string, unknown>;
    return [
      { key: `${String(row.key)}.measured`, label: `${name[0]!.toUpperCase()}${name.slice(1)}, measured`, unit: 'Hz', value: measuredValue(measured) },
      { key: `${String(row.key)}.estimate`, label: `${name[0]!.toUpperCase()}${name.slice(1)}, estimate`, unit: 'Hz', value: figure(estimate.valueHz) },
    ];
  });
}

export interface DiffSide {
  readonly id: number;
  readonly label: string;
  readonly spec: unknown;
  readonly manifest: ManifestSide;
  readonly margins: unknown;
  /** results.acquisition (null for a release cut before it was stored). */
  readonly acquisition?: unknown;
}

const SECTIONS = [
  { id: 'formats', title: 'Word formats' },
  { id: 'widths', title: 'Widths and counts' },
  { id: 'codes', title: 'Integer codes' },
  { id: 'tables', title: 'Tables' },
  { id: 'spec', title: 'Spec' },
  { id: 'margins', title: 'Margins' },
  { id: 'acquisition', title: 'Acquisition' },
] as const;

type SectionId = (typeof SECTIONS)[number]['id'];

function figuresOf(side: DiffSide): Record<SectionId, Figure[]> {
  return { ...constantFigures(side.manifest), spec: specFigures(side.spec), margins: marginFigures(side.margins), acquisition: acquisitionFigures(side.acquisition) };
}

export function releaseDiff(from: DiffSide, to: DiffSide): ReleaseDiff {
  const before = figuresOf(from);
  const after = figuresOf(to);
  const sections: DiffSection[] = SECTIONS.map((s) => ({ id: s.id, title: s.title, rows: changedFigures(before[s.id], after[s.id]) }));
  return { from: { id: from.id, label: from.label }, to: { id: to.id, label: to.label }, sections };
}
