/**
 * What the server computes from a stored spec before anything is rendered: one planDesign of the spec
 * (packages/dsp) with its golden vectors, the numbers that count. The bit-true constants the files
 * state and the vectors the release ships come from that same plan, so they cannot disagree.
 */
import { measurePlanAcquisition, tryPlanDesign, type AnalysisResult, type DesignPlan, type SpecIssue } from '@loopwright/dsp';
import type { HexMemoryFile } from './hexVectors.ts';
import { releaseVectors } from './vectors.ts';
import { referenceRtlSummary } from './rtl.ts';

/** A plan whose loop has a bit-true form: what the constants, the RTL and an estimate are made of. */
export type BitTrueDesign = DesignPlan & {
  readonly quantized: NonNullable<DesignPlan['quantized']>;
  readonly bitTrue: NonNullable<DesignPlan['bitTrue']>;
};

/** A plan a release can be made of: a bit-true loop and its golden vectors. */
export type ReleasablePlan = BitTrueDesign & { readonly goldenVectors: NonNullable<DesignPlan['goldenVectors']> };

export interface ReleaseComputation {
  readonly plan: ReleasablePlan;
  /** Everything the server computed, stored verbatim in the manifest's `results` (each figure once). */
  readonly results: Readonly<Record<string, unknown>>;
  /** The golden-vector CSV's bytes. */
  readonly vectorsCsv: Buffer;
  readonly vectorColumns: readonly { name: string; meaning: string }[];
  /** The golden vectors as $readmemh files, one per column. */
  readonly vectorHex: readonly HexMemoryFile[];
}

type Refused = { readonly ok: false; readonly issues: readonly SpecIssue[] };
export type ComputeDesignResult = { readonly ok: true; readonly plan: BitTrueDesign } | Refused;
export type ComputeReleaseResult = { readonly ok: true; readonly release: ReleaseComputation } | Refused;

/**
 * A file the render step refuses for its size, naming the spec field that sizes it (render/artifactFile.ts);
 * the release service and the CLI turn it into their error like any other spec issue.
 */
export class RenderInputError extends Error {
  override readonly name = 'RenderInputError';
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/** The analysis without its plot arrays (the app recomputes plots from the spec). */
function manifestAnalysis(analysis: AnalysisResult): Record<string, unknown> {
  const { bode: _bode, stepResponses: _steps, ...numbers } = analysis;
  return numbers;
}

function refusal(plan: DesignPlan): Refused {
  const issue = plan.bitTrueIssue ?? plan.goldenVectorsIssue ?? { field: 'fixedPoint', message: 'the loop has no bit-true form' };
  return { ok: false, issues: [issue] };
}

/** Plan a spec whose bit-true loop is needed (an estimate of its RTL); its field issues otherwise. */
export function computeDesign(input: unknown): ComputeDesignResult {
  const planned = tryPlanDesign(input);
  if (!planned.ok) return planned;
  const { plan } = planned;
  return plan.quantized && plan.bitTrue ? { ok: true, plan: plan as BitTrueDesign } : refusal(plan);
}

/** Plan a spec for a release, golden vectors included; a spec that cannot be released gives its field issues. */
export function computeRelease(input: unknown): ComputeReleaseResult {
  const planned = tryPlanDesign(input, { goldenVectors: true });
  if (!planned.ok) return planned;
  const { plan } = planned;
  if (!plan.quantized || !plan.bitTrue || !plan.goldenVectors) return refusal(plan);
  const releasable = plan as ReleasablePlan;
  const vectors = releaseVectors(releasable);
  return {
    ok: true,
    release: {
      plan: releasable,
      results: {
        analysis: manifestAnalysis(plan.analysis),
        // Measured at the cut from the stored spec (under a second per demo spec), beside the estimates.
        acquisition: measurePlanAcquisition(plan),
        vectors: vectors.summary,
        referenceRtl: referenceRtlSummary(releasable.bitTrue, vectors.summary.samples),
      },
      vectorsCsv: vectors.csv,
      vectorColumns: vectors.columns,
      vectorHex: vectors.hex,
    },
  };
}
