/**
 * planDesign: the one computation of a design. A spec is parsed once (parseLoopSpec gives a ValidSpec)
 * and every number the editor, the API, a release and the terminal show comes from this one result,
 * built in steps that each take what the step before derived:
 *
 *   spec ─▶ filter (designLoopFilter: analog prototype, bilinear sections)
 *        ─▶ quantized (quantizeSections of filter.sections to fixedPoint's coefficient format)
 *        ─▶ nco (ncoSummary: tuning word, spur and SNR estimates, control scaling)
 *        ─▶ bitTrue (planBitTrue of quantized + nco: coefficient codes, tuning word, gain, sine table)
 *        ─▶ analysis (analyzeParts of filter + quantized + nco: responses, margins, verdict, …)
 *        ─▶ goldenVectors, on request (the bitTrue constants run on the release's scenario)
 *
 * Downstream code reads figures from here and never derives one again; the release renders the
 * bitTrue constants and ships the vectors they produced.
 */
import { parseLoopSpec, requireValidSpec, specWarnings, type LoopSpec, type SpecIssue, type ValidSpec } from './spec/schema.ts';
import type { Scenario } from './spec/scenario.ts';
import type { QuantizedFilter } from './types/fixed.ts';
import type { AcquisitionComparison, AcquisitionOptions, BitTruePlan, SimOptions, SimResult } from './types/sim.ts';
import { measureAcquisition } from './analysis/acquisitionSim.ts';
import { compareAcquisition } from './analysis/acquisitionReport.ts';
import { designLoopFilter, type LoopFilterDesign } from './design.ts';
import { FieldError } from './fixed/fieldError.ts';
import { quantizeSections } from './fixed/quantizeSections.ts';
import { ncoSummary, type NcoSummary } from './analysis/ncoSummary.ts';
import type { QuantizationOutcome } from './analysis/quantizedLoop.ts';
import { analyzeParts, type AnalysisResult, type AnalyzeOptions } from './analysis/analyzeDesign.ts';
import { scenarioReachWarning } from './analysis/fixedPointReach.ts';
import { planBitTrue } from './sim/bitTruePlan.ts';
import { simulateLoop, simulateLoopAsync, type SimLoop } from './sim/simulate.ts';
import { goldenVectorsOf, releaseGoldenVectors, type GoldenVectors } from './vectors/goldenVectors.ts';

export interface PlanOptions extends AnalyzeOptions {
  /** Also run the golden vectors: `true` for the release's scenario (defaultGoldenScenario), or a scenario of one's own. */
  readonly goldenVectors?: boolean | Scenario;
}

/** The one result of a design (readonly throughout; the object and every object in it are frozen, arrays of numbers readonly by type: deepFreeze). */
export interface DesignPlan {
  readonly spec: ValidSpec;
  /** The loop filter: analog prototype, digital b/a and the second-order sections firmware implements. */
  readonly filter: LoopFilterDesign;
  /** The sections quantised to fixedPoint's coefficient format; null when the format cannot hold them (analysis.quantization.error says why). */
  readonly quantized: QuantizedFilter | null;
  /** The NCO at the loop rate: tuning word, spur and SNR estimates, control scaling (or why it failed). */
  readonly nco: NcoSummary;
  /** Every integer constant of the bit-true loop; null when the loop has no bit-true form (bitTrueIssue says why). */
  readonly bitTrue: BitTruePlan | null;
  /** Why there is no bit-true loop (quantisation or control scaling failed): the field to change and why. */
  readonly bitTrueIssue: SpecIssue | null;
  /** Everything the analysis reports, from the parts above. */
  readonly analysis: AnalysisResult;
  /** The golden vectors of bitTrue, when asked for (null otherwise, or when there is no bit-true loop). */
  readonly goldenVectors: GoldenVectors | null;
  /** Why the golden vectors could not be made although asked for (their scenario does not fit the loop). */
  readonly goldenVectorsIssue: SpecIssue | null;
}

export type PlanDesignResult = { readonly ok: true; readonly plan: DesignPlan } | { readonly ok: false; readonly issues: readonly SpecIssue[] };

/** A step that may refuse with a FieldError (the widths cannot represent the design), as a value. */
function attempt<T>(step: () => T): { readonly value: T; readonly issue: null } | { readonly value: null; readonly issue: SpecIssue } {
  try {
    return { value: step(), issue: null };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return { value: null, issue: { field: err.field, message: err.message } };
  }
}

/** The steps of planDesign up to its analysis: what the bit-true constants and the vectors are planned from. */
function analysisSteps(spec: ValidSpec, options: AnalyzeOptions) {
  const filter = designLoopFilter(spec);
  const q = attempt(() => quantizeSections(filter.sections, spec.fixedPoint));
  const quantization: QuantizationOutcome = q.value ? { filter: q.value, error: null } : { filter: null, error: q.issue };
  const nco = ncoSummary(spec);
  const analysis = analyzeParts(spec, specWarnings(spec), { filter, quantization, nco }, options);
  return { filter, q, nco, analysis };
}

/** Plan a valid spec (see the module comment); never throws for a ValidSpec. */
export function planDesign(spec: ValidSpec, options: PlanOptions = {}): DesignPlan {
  const { filter, q, nco, analysis } = analysisSteps(spec, options);
  const bitTrueIssue = q.issue ?? nco.controlError;
  const bitTrue = q.value && nco.control ? planBitTrue(spec, { quantized: q.value, tuning: nco.tuning, control: nco.control }) : null;
  const loop: SimLoop = { spec, sections: filter.sections, bitTrue, bitTrueIssue };
  const wanted = options.goldenVectors;
  const vectors = !wanted || !bitTrue ? null : attempt(() => (wanted === true ? releaseGoldenVectors(loop) : goldenVectorsOf(loop, wanted)));
  return deepFreeze({
    spec,
    filter,
    quantized: q.value,
    nco,
    bitTrue,
    bitTrueIssue,
    analysis,
    goldenVectors: vectors?.value ?? null,
    goldenVectorsIssue: vectors?.issue ?? null,
  });
}

/** Parse any input and plan it; never throws: an invalid spec gives its field issues. */
export function tryPlanDesign(input: unknown, options: PlanOptions = {}): PlanDesignResult {
  const parsed = parseLoopSpec(input);
  if (!parsed.ok) return { ok: false, issues: parsed.issues };
  return { ok: true, plan: planDesign(parsed.spec, options) };
}

/**
 * Freeze the plan and every object in it, so no reader can change a figure another reader sees.
 * Arrays of plain numbers (the plot grids and traces, about 8,000 doubles a plan) stay as made, readonly
 * in their types only, like the typed arrays (the sine table, vector records), which cannot be frozen
 * and whose owners never write them: the JavaScript engine freezes a double array by boxing every element, which took a
 * sixth of a warm analyzeDesign (0.35 of 2.3 ms measured on the mains demo). Scanning those arrays for
 * objects with for…of cost 0.26 ms more; indexed loops over the objects alone take 0.03 ms.
 */
function deepFreeze<T>(value: T): T {
  if (value === null || typeof value !== 'object' || ArrayBuffer.isView(value) || Object.isFrozen(value)) return value;
  if (Array.isArray(value)) {
    // The result types hold no mixed arrays: one whose first element is a number holds only numbers.
    if (typeof value[0] === 'number') return value;
    Object.freeze(value);
    for (let i = 0; i < value.length; i++) deepFreeze(value[i]);
    return value;
  }
  Object.freeze(value);
  // for…in rather than Object.keys: no array of keys per object (half of this walk's 31 µs on the
  // mains demo). The plan holds plain objects only, so it visits the same own keys.
  for (const key in value) deepFreeze((value as Record<string, unknown>)[key]);
  return value;
}

/** The loop a simulation of the plan runs (its sections and its bit-true constants). */
function loopOf(plan: DesignPlan): SimLoop {
  return { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue };
}

/** Simulate a planned design under a scenario: float and/or bit-true loop on the same input. */
export function simulatePlan(plan: DesignPlan, scenario: Scenario, options: SimOptions = {}): SimResult {
  return withReachWarning(plan, scenario, simulateLoop(loopOf(plan), scenario, options));
}

/** The result with the warning of a scenario beyond what the fixed-point loop can hold (none: as it came). */
function withReachWarning(plan: DesignPlan, scenario: Scenario, result: SimResult): SimResult {
  const warning = scenarioReachWarning(plan.analysis.fixedPointReach, scenario);
  return { ...result, warnings: warning ? [warning] : [] };
}

/**
 * The plan's acquisition figures, each as the analysis's estimate and as measured by simulating the
 * nonlinear loop: what the CLI, the API, a release and the editor show (README "Acquisition").
 */
export function measurePlanAcquisition(plan: DesignPlan, options: AcquisitionOptions = {}): AcquisitionComparison {
  return compareAcquisition(plan.analysis.estimates, measureAcquisition(plan.spec, options));
}

/** As simulatePlan, yielding to the event loop between chunks (a worker can receive a cancel). */
export async function simulatePlanAsync(plan: DesignPlan, scenario: Scenario, options: SimOptions = {}): Promise<SimResult> {
  return withReachWarning(plan, scenario, await simulateLoopAsync(loopOf(plan), scenario, options));
}

// Conveniences for a spec held as a plain object (examples and tests): validate, plan, read one part.

/**
 * The analysis of a spec, as planDesign(...).analysis (the same steps, frozen alike) without the bit-true
 * constants and the sine table it never reads; throws LoopSpecError naming the fields of an invalid spec.
 */
export function analyzeDesign(spec: LoopSpec, options: AnalyzeOptions = {}): AnalysisResult {
  return deepFreeze(analysisSteps(requireValidSpec(spec), options).analysis);
}

/** The analysis of any input, or its field issues; never throws. */
export function tryAnalyzeDesign(input: unknown, options: AnalyzeOptions = {}): { readonly ok: true; readonly result: AnalysisResult } | { readonly ok: false; readonly issues: readonly SpecIssue[] } {
  const r = tryPlanDesign(input, options);
  return r.ok ? { ok: true, result: r.plan.analysis } : r;
}

/** Simulate a spec (planDesign, then simulatePlan); throws LoopSpecError for an invalid spec. */
export function simulate(spec: LoopSpec, scenario: Scenario, options: SimOptions = {}): SimResult {
  return simulatePlan(planDesign(requireValidSpec(spec)), scenario, options);
}

/** As simulate, yielding between chunks. */
export function simulateAsync(spec: LoopSpec, scenario: Scenario, options: SimOptions = {}): Promise<SimResult> {
  return simulatePlanAsync(planDesign(requireValidSpec(spec)), scenario, options);
}

/** The golden vectors of a spec's bit-true loop (default: the release's scenario); throws a FieldError when it has none. */
export function goldenVectors(spec: LoopSpec, scenario?: Scenario): GoldenVectors {
  const loop = loopOf(planDesign(requireValidSpec(spec)));
  return scenario === undefined ? releaseGoldenVectors(loop) : goldenVectorsOf(loop, scenario);
}
