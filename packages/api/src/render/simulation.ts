/**
 * A simulation from the terminal: plan the spec (planDesign) and parse the scenario, each issue naming
 * its field; run the plan's float and bit-true loops side by side and report the metrics (and, on
 * request, the first N samples of the bit-true record in the release's CSV format, from the same run).
 */
import { FieldError, formatVectorsCsv, isScenarioField, parseScenario, simulatePlan, tryPlanDesign, type SimMetrics, type SpecIssue } from '@loopwright/dsp';

export type InputLabel = 'SPEC.json' | 'SCENARIO.json';

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

export type SimulationOutcome = { readonly ok: true; readonly output: SimulationOutput } | { readonly ok: false; readonly label: InputLabel; readonly issues: readonly SpecIssue[] };

export function simulateScenario(specInput: unknown, scenarioInput: unknown, vectors: number | undefined): SimulationOutcome {
  const planned = tryPlanDesign(specInput);
  if (!planned.ok) return { ok: false, label: 'SPEC.json', issues: planned.issues };
  const scenario = parseScenario(scenarioInput);
  if (!scenario.ok) return { ok: false, label: 'SCENARIO.json', issues: scenario.issues };
  try {
    const result = simulatePlan(planned.plan, scenario.scenario, { keepRecord: vectors !== undefined });
    const bitTrue = result.bitTrue;
    const record = bitTrue?.record;
    const csv = vectors !== undefined && bitTrue && record
      ? formatVectorsCsv({ scenario: scenario.scenario, ncoAccumulatorBits: planned.plan.spec.nco.accumulatorBits, record, checksum: bitTrue.checksum }, vectors)
      : '';
    return {
      ok: true,
      output: {
        metrics: {
          sampleCount: result.sampleCount,
          sampleRateHz: result.sampleRateHz,
          durationS: result.durationS,
          float: result.float?.metrics ?? null,
          bitTrue: bitTrue ? { ...bitTrue.metrics, checksum: bitTrue.checksum } : null,
        },
        vectorsCsv: csv,
      },
    };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    // Scenario fields (durationS …) and spec fields (fixedPoint.…) both reach here; the path tells which.
    return { ok: false, label: isScenarioField(err.field) ? 'SCENARIO.json' : 'SPEC.json', issues: [{ field: err.field, message: err.message }] };
  }
}
