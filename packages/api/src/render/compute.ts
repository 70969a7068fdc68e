/**
 * What the server computes from a stored spec before anything is rendered: the analysis, the
 * quantised sections, the NCO set-up and the golden vectors, all from packages/dsp (the server's
 * numbers are the ones that count). Validation happens here, at the public entry, and names the field.
 */
import {
  analyzeDesign,
  FieldError,
  parseLoopSpec,
  planBitTrue,
  type AnalysisResult,
  type LoopSpec,
  type BitTruePlan,
  type QuantizedFilter,
} from '@loopwright/dsp';
import type { ReleaseComputation } from './artifacts.ts';
import { goldenVectorsFor, type ReleaseVectors } from './vectors.ts';

export class RenderInputError extends Error {
  override readonly name = 'RenderInputError';
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/** The results a manifest records: the analysis without its plot arrays (the app recomputes plots). */
export function manifestResults(analysis: AnalysisResult, extra: Record<string, unknown>): Record<string, unknown> {
  const { bode: _bode, stepResponses: _steps, ...numbers } = analysis;
  return { analysis: numbers, ...extra };
}

export function validSpec(input: unknown): LoopSpec {
  const parsed = parseLoopSpec(input);
  if (!parsed.ok) {
    const first = parsed.issues[0];
    throw new RenderInputError(first?.field ?? '', parsed.issues.map((i) => i.message).join('; '));
  }
  return parsed.spec;
}

/** Everything but the golden vectors (the benchmark times the two apart). */
export interface DesignComputation {
  readonly spec: LoopSpec;
  readonly analysis: AnalysisResult;
  readonly quantized: QuantizedFilter;
  /** Every integer constant of the bit-true loop (dsp README, "Bit-true arithmetic"). */
  readonly plan: BitTruePlan;
}

export function computeDesign(spec: LoopSpec): DesignComputation {
  const analysis = analyzeDesign(spec);
  const quantized = analysis.quantization.filter;
  if (!quantized) {
    const e = analysis.quantization.error;
    throw new RenderInputError(e?.field ?? 'fixedPoint', `the loop filter cannot be quantised: ${e?.message ?? 'unknown reason'}`);
  }
  let plan: BitTruePlan;
  try {
    plan = planBitTrue(spec, quantized);
  } catch (err) {
    if (err instanceof FieldError) throw new RenderInputError(err.field, err.message);
    throw err;
  }
  return { spec, analysis, quantized, plan };
}

export function withVectors(d: DesignComputation, vectors: ReleaseVectors): ReleaseComputation {
  return {
    spec: d.spec,
    quantized: d.quantized,
    plan: d.plan,
    results: manifestResults(d.analysis, { nco: { tuning: d.plan.tuning, control: d.plan.control, fullScale: d.plan.ncoFullScale }, vectors: vectors.summary }),
    vectorsCsv: vectors.csv,
    vectorColumns: vectors.columns,
    vectorHex: vectors.hex,
    vectorSamples: vectors.summary.samples,
  };
}

export function computeRelease(input: unknown): ReleaseComputation {
  const spec = validSpec(input);
  const design = computeDesign(spec);
  let vectors: ReleaseVectors;
  try {
    vectors = goldenVectorsFor(spec);
  } catch (err) {
    if (err instanceof FieldError) throw new RenderInputError(err.field, err.message);
    throw err;
  }
  return withVectors(design, vectors);
}
