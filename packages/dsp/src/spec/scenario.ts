/**
 * Simulation scenario (DESIGN.md): a second small JSON document beside the loop spec.
 * kind "tone" (offsetHz), "frequency-step" (stepHz, atS), "phase-step" (stepDeg, atS),
 * "fm" (modulation sine/triangle/square, rateHz, deviationHz); durationS; optional snrDb, seed,
 * initialPhaseDeg. Strict objects: a misspelt field is an error naming it.
 */
import { z } from 'zod';

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

export const scenarioSchema = z.discriminatedUnion('kind', [
  toneScenarioSchema,
  frequencyStepScenarioSchema,
  phaseStepScenarioSchema,
  fmScenarioSchema,
]);

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
  const result = scenarioSchema.safeParse(input);
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
