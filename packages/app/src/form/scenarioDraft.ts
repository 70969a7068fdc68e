/**
 * The simulation panel's scenario form: presets the user picks from, and their text drafts turned
 * into the scenario document the shared zod schema (parseScenario) checks.
 */
import { parseScenario, type Scenario } from '@loopwright/dsp';
import { parseNumberText } from './specDraft.ts';
import { fieldMessage } from '../lib/messages.ts';

export const SCENARIO_PRESETS = [
  { value: 'tone', label: 'Tone at a frequency offset' },
  { value: 'frequency-step', label: 'Frequency step' },
  { value: 'phase-step', label: 'Phase step' },
  { value: 'fm-sine', label: 'FM, sine modulation' },
  { value: 'fm-triangle', label: 'FM, triangle modulation' },
  { value: 'fm-square', label: 'FM, square modulation' },
  { value: 'noise', label: 'Noise: locked tone with a given SNR' },
  { value: 'sweep', label: 'Sweep out and back (where lock is lost and regained)' },
] as const;

export type ScenarioPreset = (typeof SCENARIO_PRESETS)[number]['value'];

export interface ScenarioFieldDef {
  readonly key: string;
  readonly label: string;
  readonly unit: string;
  readonly presets: readonly ScenarioPreset[];
}

const ALL: readonly ScenarioPreset[] = SCENARIO_PRESETS.map((p) => p.value);
const FM: readonly ScenarioPreset[] = ['fm-sine', 'fm-triangle', 'fm-square'];

export const SCENARIO_FIELDS: readonly ScenarioFieldDef[] = [
  { key: 'offsetHz', label: 'Frequency offset', unit: 'Hz', presets: ['tone', 'noise'] },
  { key: 'stepHz', label: 'Step size', unit: 'Hz', presets: ['frequency-step'] },
  { key: 'stepDeg', label: 'Step size', unit: '°', presets: ['phase-step'] },
  { key: 'atS', label: 'Step at', unit: 's', presets: ['frequency-step', 'phase-step'] },
  { key: 'rateHz', label: 'Modulation rate', unit: 'Hz', presets: FM },
  { key: 'deviationHz', label: 'Peak deviation', unit: 'Hz', presets: FM },
  { key: 'fromHz', label: 'Sweep from offset', unit: 'Hz', presets: ['sweep'] },
  { key: 'toHz', label: 'Sweep to offset', unit: 'Hz', presets: ['sweep'] },
  { key: 'rateHzPerS', label: 'Sweep rate', unit: 'Hz/s', presets: ['sweep'] },
  { key: 'durationS', label: 'Duration', unit: 's', presets: ALL },
  { key: 'snrDb', label: 'Input SNR (blank: no noise)', unit: 'dB', presets: ALL },
  { key: 'initialPhaseDeg', label: 'Initial phase', unit: '°', presets: ALL },
  { key: 'seed', label: 'Noise seed', unit: '#', presets: ALL },
];

export type ScenarioDraft = Record<string, string>;

export function fieldsFor(preset: ScenarioPreset): ScenarioFieldDef[] {
  return SCENARIO_FIELDS.filter((f) => f.presets.includes(preset));
}

/** Starting values scaled to the loop: offsets near its crossover, a run of several time constants. */
export function defaultScenarioDraft(crossoverHz: number | null, sampleRateHz: number): ScenarioDraft {
  const fc = crossoverHz && crossoverHz > 0 ? crossoverHz : sampleRateHz / 1000;
  const maxDurationS = 400_000 / sampleRateHz;
  const durationS = Math.min(30 / fc, maxDurationS);
  const round = (x: number) => String(Number(x.toPrecision(2)));
  // A sweep to twice the crossover and back in 80 % of the run: the rate rounded up, so it still fits.
  const sweepToHz = Number((2 * fc).toPrecision(2));
  const sweepRate = Number((sweepToHz / (0.4 * Number(round(durationS)))).toPrecision(2));
  const sweepRateHzPerS = 2 * sweepToHz / sweepRate <= Number(round(durationS)) ? sweepRate : Number((sweepRate * 1.1).toPrecision(2));
  return {
    fromHz: '0',
    toHz: String(sweepToHz),
    rateHzPerS: String(sweepRateHzPerS),
    offsetHz: round(0.2 * fc),
    stepHz: round(0.2 * fc),
    stepDeg: '45',
    atS: round(durationS / 5),
    rateHz: round(fc / 8),
    deviationHz: round(0.3 * fc),
    durationS: round(durationS),
    snrDb: '',
    initialPhaseDeg: '0',
    seed: '1',
  };
}

function common(d: Readonly<ScenarioDraft>): Record<string, unknown> {
  const out: Record<string, unknown> = { durationS: parseNumberText(d['durationS']) };
  for (const key of ['snrDb', 'initialPhaseDeg', 'seed']) {
    const v = parseNumberText(d[key]);
    if (v !== undefined) out[key] = v;
  }
  return out;
}

export function draftToScenario(preset: ScenarioPreset, d: Readonly<ScenarioDraft>): Record<string, unknown> {
  const n = (k: string) => parseNumberText(d[k]);
  switch (preset) {
    case 'tone':
      return { kind: 'tone', offsetHz: n('offsetHz'), ...common(d) };
    case 'noise':
      return { kind: 'tone', offsetHz: n('offsetHz') ?? 0, ...common(d), snrDb: n('snrDb') ?? 10 };
    case 'frequency-step':
      return { kind: 'frequency-step', stepHz: n('stepHz'), atS: n('atS'), ...common(d) };
    case 'phase-step':
      return { kind: 'phase-step', stepDeg: n('stepDeg'), atS: n('atS'), ...common(d) };
    case 'fm-sine':
    case 'fm-triangle':
    case 'fm-square':
      return { kind: 'fm', modulation: preset.slice(3), rateHz: n('rateHz'), deviationHz: n('deviationHz'), ...common(d) };
    case 'sweep':
      return { kind: 'sweep', fromHz: n('fromHz'), toHz: n('toHz'), rateHzPerS: n('rateHzPerS'), ...common(d) };
  }
}

export interface ScenarioCheck {
  readonly scenario: Scenario | null;
  readonly errors: Readonly<Record<string, string>>;
}

export function checkScenario(preset: ScenarioPreset, d: Readonly<ScenarioDraft>): ScenarioCheck {
  const result = parseScenario(draftToScenario(preset, d));
  if (result.ok) return { scenario: result.scenario, errors: {} };
  const errors: Record<string, string> = {};
  for (const issue of result.issues) {
    // One sentence naming the field by the label the simulation form gives it, with the bound's unit.
    const shown = SCENARIO_FIELDS.find((f) => f.key === issue.field);
    errors[issue.field] = fieldMessage(issue.field, issue.message, shown);
  }
  return { scenario: null, errors };
}
