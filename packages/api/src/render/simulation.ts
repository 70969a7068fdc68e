/**
 * A simulation from the terminal: validate the spec and the scenario (each issue names its field),
 * run dsp's float and bit-true loops side by side, and report the metrics (and, on request, the first
 * N golden vectors in the release's CSV format).
 */
import { FieldError, isScenarioField, parseLoopSpec, parseScenario, simulate, type SimMetrics, type SimResult } from '@loopwright/dsp';
import { scenarioVectorsCsv } from './vectors.ts';

export class ScenarioInputError extends Error {
  override readonly name = 'ScenarioInputError';
  constructor(
    readonly label: 'SPEC.json' | 'SCENARIO.json',
    readonly issues: readonly { field: string; message: string }[],
  ) {
    super(`${label}: ${issues[0]?.message ?? 'invalid'}`);
  }
}

export interface SimulationOutput {
  readonly metrics: {
    readonly sampleCount: number;
    readonly sampleRateHz: number;
    readonly durationS: number;
    readonly float: SimMetrics | null;
    /** With the FNV-1a checksum of the bit-true record (dsp README, "Golden vectors"). */
    readonly bitTrue: (SimMetrics & { readonly checksum: number }) | null;
  };
  readonly vectorsCsv: string;
}

export function simulateScenario(specInput: unknown, scenarioInput: unknown, vectors: number | undefined): SimulationOutput {
  const spec = parseLoopSpec(specInput);
  if (!spec.ok) throw new ScenarioInputError('SPEC.json', spec.issues);
  const scenario = parseScenario(scenarioInput);
  if (!scenario.ok) throw new ScenarioInputError('SCENARIO.json', scenario.issues);
  let result: SimResult;
  let csv = '';
  try {
    result = simulate(spec.spec, scenario.scenario);
    if (vectors !== undefined) csv = scenarioVectorsCsv(spec.spec, scenario.scenario, vectors);
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    // Scenario fields (durationS …) and spec fields (fixedPoint.…) both reach here; the path tells which.
    const label = isScenarioField(err.field) ? 'SCENARIO.json' : 'SPEC.json';
    throw new ScenarioInputError(label, [{ field: err.field, message: err.message }]);
  }
  const bitTrue = result.bitTrue;
  return {
    metrics: {
      sampleCount: result.sampleCount,
      sampleRateHz: result.sampleRateHz,
      durationS: result.durationS,
      float: result.float?.metrics ?? null,
      bitTrue: bitTrue ? { ...bitTrue.metrics, checksum: bitTrue.checksum } : null,
    },
    vectorsCsv: csv,
  };
}
