/**
 * The spec form, described as data: which fields exist, their units and which filter kind
 * shows them. Paths are the spec's own dot paths, so the shared zod schema's issues land on
 * the field that caused them.
 */

import { fmtEng } from '../lib/format.ts';

export type FieldKind = 'number' | 'integer' | 'text' | 'select' | 'auto-integer';

export interface FieldDef {
  readonly path: string;
  readonly label: string;
  readonly unit: string;
  readonly kind: FieldKind;
  readonly options?: readonly { readonly value: string; readonly label: string }[];
  readonly hint?: string;
  /** Shown only when this returns true for the current draft. */
  readonly when?: (draft: Readonly<Record<string, string>>) => boolean;
}

export interface SectionDef {
  readonly id: string;
  readonly title: string;
  readonly fields: readonly FieldDef[];
}

const filterKindIs = (...kinds: string[]) => (d: Readonly<Record<string, string>>) =>
  kinds.includes(d['filter.kind'] ?? '');
const secondOrder = filterKindIs('lag-lead', 'pi');
const byTargets = (d: Readonly<Record<string, string>>) => secondOrder(d) && d['filter.mode'] === 'targets';
const byTau = (d: Readonly<Record<string, string>>) => secondOrder(d) && d['filter.mode'] !== 'targets';
const rippleOn = (d: Readonly<Record<string, string>>) => d['rippleFilter.enabled'] === 'true';
const prewarpOn = (d: Readonly<Record<string, string>>) => d['discretization.prewarp'] === 'true';

export const SPEC_SECTIONS: readonly SectionDef[] = [
  {
    id: 'rates',
    title: 'Clock and rates',
    fields: [
      { path: 'name', label: 'Identifier', unit: 'id', kind: 'text', hint: 'Becomes the VHDL, Verilog and C name' },
      { path: 'clockHz', label: 'Fabric clock', unit: 'Hz', kind: 'number' },
      { path: 'sampleRateHz', label: 'Loop update rate', unit: 'Hz', kind: 'number' },
      { path: 'centerHz', label: 'NCO centre frequency', unit: 'Hz', kind: 'number' },
      { path: 'input.amplitude', label: 'Input amplitude (peak)', unit: 'FS', kind: 'number', hint: '1.0 = full scale' },
    ],
  },
  {
    id: 'nco',
    title: 'NCO',
    fields: [
      { path: 'nco.accumulatorBits', label: 'Phase accumulator', unit: 'bits', kind: 'integer' },
      { path: 'nco.phaseBits', label: 'Sine table address', unit: 'bits', kind: 'integer' },
      { path: 'nco.amplitudeBits', label: 'Output amplitude', unit: 'bits', kind: 'integer' },
      { path: 'nco.gainHzPerUnit', label: 'NCO gain', unit: 'Hz/unit', kind: 'number' },
      {
        path: 'nco.waveform',
        label: 'Waveform',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'sine', label: 'Sine' },
          { value: 'square', label: 'Square' },
        ],
      },
    ],
  },
  {
    id: 'filter',
    title: 'Loop filter',
    fields: [
      {
        path: 'filter.kind',
        label: 'Filter kind',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'single-pole', label: 'Single-pole low-pass' },
          { value: 'lag-lead', label: 'Lag-lead (passive)' },
          { value: 'pi', label: 'PI (type 2)' },
          { value: 'butterworth', label: 'Butterworth low-pass' },
        ],
      },
      {
        path: 'filter.mode',
        label: 'Set by',
        unit: '—',
        kind: 'select',
        when: secondOrder,
        options: [
          { value: 'targets', label: 'Natural frequency and damping' },
          { value: 'time-constants', label: 'Time constants τ1, τ2' },
        ],
      },
      { path: 'filter.naturalHz', label: 'Natural frequency', unit: 'Hz', kind: 'number', when: byTargets },
      { path: 'filter.damping', label: 'Damping ζ', unit: '—', kind: 'number', when: byTargets },
      { path: 'filter.tau1S', label: 'τ1', unit: 's', kind: 'number', when: byTau },
      { path: 'filter.tau2S', label: 'τ2', unit: 's', kind: 'number', when: byTau },
      { path: 'filter.order', label: 'Order', unit: '1–4', kind: 'integer', when: filterKindIs('butterworth') },
      { path: 'filter.cutoffHz', label: 'Cut-off', unit: 'Hz', kind: 'number', when: filterKindIs('single-pole', 'butterworth') },
    ],
  },
  {
    id: 'ripple',
    title: 'Ripple filter',
    fields: [
      {
        path: 'rippleFilter.enabled',
        label: 'Butterworth in series',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'false', label: 'None' },
          { value: 'true', label: 'Against the 2·f ripple' },
        ],
      },
      { path: 'rippleFilter.order', label: 'Order', unit: '1–4', kind: 'integer', when: rippleOn },
      { path: 'rippleFilter.cutoffHz', label: 'Cut-off', unit: 'Hz', kind: 'number', when: rippleOn },
    ],
  },
  {
    id: 'discretization',
    title: 'Bilinear transform',
    fields: [
      {
        path: 'discretization.prewarp',
        label: 'Prewarp',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'false', label: 'No prewarping' },
          { value: 'true', label: 'Prewarp at a frequency' },
        ],
      },
      { path: 'discretization.prewarpHz', label: 'Prewarp frequency', unit: 'Hz', kind: 'number', when: prewarpOn },
    ],
  },
  {
    id: 'fixed',
    title: 'Fixed point',
    fields: [
      { path: 'fixedPoint.coefficientBits', label: 'Coefficient width', unit: 'bits', kind: 'integer' },
      {
        path: 'fixedPoint.coefficientFractionBits',
        label: 'Coefficient fraction',
        unit: 'bits',
        kind: 'auto-integer',
        hint: 'A number, or "auto" for the most that still hold every coefficient',
      },
      { path: 'fixedPoint.dataBits', label: 'Data width', unit: 'bits', kind: 'integer' },
      { path: 'fixedPoint.accumulatorBits', label: 'Accumulator width', unit: 'bits', kind: 'integer' },
      {
        path: 'fixedPoint.rounding',
        label: 'Rounding',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'nearest', label: 'Nearest, half away from zero' },
          { value: 'half-even', label: 'Nearest, half to even' },
          { value: 'truncate', label: 'Truncate (toward −∞)' },
        ],
      },
      {
        path: 'fixedPoint.overflow',
        label: 'Overflow',
        unit: '—',
        kind: 'select',
        options: [
          { value: 'saturate', label: 'Saturate' },
          { value: 'wrap', label: 'Wrap' },
        ],
      },
    ],
  },
];

/**
 * Big and small numbers read more easily with a prefix: "100000000" Hz is shown as "= 100 MHz"
 * beside the field. Empty for values that read well as typed (or do not parse).
 */
export function readableValue(field: FieldDef, text: string | undefined): string {
  if (field.unit !== 'Hz' && field.unit !== 's') return '';
  const value = Number((text ?? '').trim());
  if (!Number.isFinite(value) || value === 0 || (text ?? '').trim() === '') return '';
  const abs = Math.abs(value);
  if (abs >= 1e-2 && abs < 1e4) return '';
  return `= ${fmtEng(value, field.unit, 6)}`;
}

/** The form's definition of a spec path (its label and unit), if the form shows that path. */
export function fieldAt(path: string): FieldDef | undefined {
  for (const section of SPEC_SECTIONS) for (const field of section.fields) if (field.path === path) return field;
  return undefined;
}

export function visibleFields(section: SectionDef, draft: Readonly<Record<string, string>>): FieldDef[] {
  return section.fields.filter((field) => !field.when || field.when(draft));
}

/** "fixedPoint.dataBits" → "fixed-point-data-bits": a stable data-test name per field. */
export function testIdFor(path: string): string {
  return path.replace(/\./g, '-').replace(/([a-z0-9])([A-Z])/g, '$1-$2').toLowerCase();
}
