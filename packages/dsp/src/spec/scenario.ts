/**
 * Simulation scenario (DESIGN.md): a second small JSON document beside the loop spec.
 * kind "tone" (offsetHz), "frequency-step" (stepHz, atS), "phase-step" (stepDeg, atS),
 * "fm" (modulation sine/triangle/square, rateHz, deviationHz), "sweep" (fromHz, toHz, rateHzPerS: the
 * offset ramps linearly out from fromHz to toHz and back, then stays at fromHz); durationS; optional snrDb, seed,
 * initialPhaseDeg. Strict objects: a misspelt field is an error naming it.
 */
import { z } from 'zod';
import { PARSE_CONTEXT } from './messages.ts';

const common = {
  durationS: z.number().positive(),
  /** Signal-to-noise ratio of the input in dB (signal power A²/2 over white Gaussian noise power). */
  snrDb: z.number().min(-30).max(200).optional(),
  /** Seed of the noise generator (32-bit unsigned); the same seed gives the same noise. */
  seed: z.number().int().min(0).max(0xffffffff).optional(),
  /** Input phase at t = 0 in degrees (the NCO starts at phase 0). */
  initialPhaseDeg: z.number().min(-360).max(360).optional(),
};

export const toneScenarioSchema = z.strictObject({ kind: z.literal('tone'), offsetHz: z.number(), ...common });
export const frequencyStepScenarioSchema = z.strictObject({
  kind: z.literal('frequency-step'),
  stepHz: z.number(),
  atS: z.number().min(0),
  ...common,
});
export const phaseStepScenarioSchema = z.strictObject({
  kind: z.literal('phase-step'),
  stepDeg: z.number().min(-360).max(360),
  atS: z.number().min(0),
  ...common,
});
export const fmScenarioSchema = z.strictObject({
  kind: z.literal('fm'),
  modulation: z.enum(['sine', 'triangle', 'square']),
  rateHz: z.number().positive(),
  deviationHz: z.number().min(0),
  ...common,
});

export const sweepScenarioSchema = z.strictObject({
  kind: z.literal('sweep'),
  fromHz: z.number(),
  toHz: z.number(),
  rateHzPerS: z.number().positive(),
  ...common,
});

/** Seconds of one leg of a sweep, fromHz to toHz (the way back takes as long). */
export function sweepLegS(s: { readonly fromHz: number; readonly toHz: number; readonly rateHzPerS: number }): number {
  return Math.abs(s.toHz - s.fromHz) / s.rateHzPerS;
}

/**
 * A step at or after the end of the run never happens, and a sweep that does not come back cannot show
 * where lock is regained: say so rather than simulate something else.
 */
export const scenarioSchema = z
  .discriminatedUnion('kind', [toneScenarioSchema, frequencyStepScenarioSchema, phaseStepScenarioSchema, fmScenarioSchema, sweepScenarioSchema])
  .superRefine((s, ctx) => {
    if ((s.kind === 'frequency-step' || s.kind === 'phase-step') && s.atS >= s.durationS) {
      ctx.addIssue({ code: 'custom', path: ['atS'], message: `atS ${s.atS} must be before the end of the run (durationS ${s.durationS})` });
    }
    if (s.kind === 'sweep' && s.toHz === s.fromHz) {
      ctx.addIssue({ code: 'custom', path: ['toHz'], message: `toHz ${s.toHz} must differ from fromHz: a sweep needs somewhere to go` });
    }
    if (s.kind === 'sweep' && s.toHz !== s.fromHz && s.durationS < 2 * sweepLegS(s) * (1 - 1e-12)) {
      const needS = Number((2 * sweepLegS(s)).toPrecision(6));
      ctx.addIssue({ code: 'custom', path: ['durationS'], message: `durationS ${s.durationS} ends before the sweep is back at fromHz: out and back at rateHzPerS ${s.rateHzPerS} takes ${needS} s` });
    }
  });

/**
 * Checks that need the loop rate: every input frequency the scenario asks for must lie strictly
 * between 0 and the Nyquist frequency sampleRateHz/2, or the sampled input aliases to another
 * frequency and the run no longer means what it says (sampling theorem; common practice, no source).
 * Returns the first offending field, or null.
 */
export function scenarioRateIssue(
  spec: { readonly sampleRateHz: number; readonly centerHz: number },
  s: Scenario,
): ScenarioIssue | null {
  const nyquistHz = spec.sampleRateHz / 2;
  const inBand = (fHz: number) => fHz > 0 && fHz < nyquistHz;
  const band = `(0, ${nyquistHz}) Hz, between 0 and sampleRateHz/2`;
  switch (s.kind) {
    case 'tone':
      return inBand(spec.centerHz + s.offsetHz) ? null : { field: 'offsetHz', message: `offsetHz ${s.offsetHz} puts the input at ${spec.centerHz + s.offsetHz} Hz, outside ${band}` };
    case 'frequency-step':
      return inBand(spec.centerHz + s.stepHz) ? null : { field: 'stepHz', message: `stepHz ${s.stepHz} puts the input at ${spec.centerHz + s.stepHz} Hz, outside ${band}` };
    case 'phase-step':
      return null;
    case 'sweep':
      if (!inBand(spec.centerHz + s.fromHz)) return { field: 'fromHz', message: `fromHz ${s.fromHz} puts the input at ${spec.centerHz + s.fromHz} Hz, outside ${band}` };
      return inBand(spec.centerHz + s.toHz) ? null : { field: 'toHz', message: `toHz ${s.toHz} puts the input at ${spec.centerHz + s.toHz} Hz, outside ${band}` };
    case 'fm':
      if (s.rateHz >= nyquistHz) return { field: 'rateHz', message: `rateHz ${s.rateHz} must be below sampleRateHz/2 = ${nyquistHz} Hz` };
      return inBand(spec.centerHz - s.deviationHz) && inBand(spec.centerHz + s.deviationHz)
        ? null
        : { field: 'deviationHz', message: `deviationHz ${s.deviationHz} swings the input outside ${band} around centerHz ${spec.centerHz}` };
  }
}

const SCENARIO_FIELDS: ReadonlySet<string> = new Set(
  [toneScenarioSchema, frequencyStepScenarioSchema, phaseStepScenarioSchema, fmScenarioSchema, sweepScenarioSchema].flatMap((schema) => Object.keys(schema.shape)),
);

/**
 * Whether the field of a FieldError thrown by a simulation is the scenario's (offsetHz, durationS …)
 * rather than the spec's (nco.phaseBits, fixedPoint.…): the two documents share no top-level name.
 */
export function isScenarioField(field: string): boolean {
  return SCENARIO_FIELDS.has(field.split('.')[0] ?? '');
}

export type Scenario = z.output<typeof scenarioSchema>;
export type ScenarioKind = Scenario['kind'];

export interface ScenarioIssue {
  readonly field: string;
  readonly message: string;
}

export type ParseScenarioResult =
  | { readonly ok: true; readonly scenario: Scenario }
  | { readonly ok: false; readonly issues: readonly ScenarioIssue[] };

/** Validate any input as a scenario. Never throws; each issue names its field (dot path). */
export function parseScenario(input: unknown): ParseScenarioResult {
  const result = scenarioSchema.safeParse(input, PARSE_CONTEXT);
  if (result.success) return { ok: true, scenario: result.data };
  return {
    ok: false,
    issues: result.error.issues.map((issue) => {
      const field = issue.path.map(String).join('.');
      if (issue.code === 'unrecognized_keys') {
        const keys = issue.keys.map((k) => (field ? `${field}.${k}` : k));
        return { field: keys[0] ?? field, message: `unknown field(s): ${keys.join(', ')}` };
      }
      return { field, message: field ? `${field}: ${issue.message}` : issue.message };
    }),
  };
}
