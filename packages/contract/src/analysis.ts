/** Analyses and simulations computed by the server (/api/analysis, /api/simulations, per design). */
import { z } from 'zod';
import { loopSpecSchema, scenarioSchema, type AcquisitionComparison, type AnalysisResult, type SimResult } from '@loopwright/dsp';

export { scenarioSchema };

export const analysisRequestSchema = z.strictObject({ spec: loopSpecSchema });
export type AnalysisRequest = z.input<typeof analysisRequestSchema>;

/** The server's analysis (packages/dsp); for a stored design, which revision it is of. */
export interface AnalysisResponse {
  readonly analysis: AnalysisResult;
  readonly designId?: number;
  readonly revision?: number;
}

/** A simulation of a stored design (POST /api/designs/:id/simulations); scenario per docs/design.md. */
export const simulationRequestSchema = z.strictObject({
  scenario: scenarioSchema,
  /** Which loops to run: float, bit-true or both side by side (default both). */
  mode: z.enum(['both', 'float', 'bit-true']).default('both'),
  /** Points of the decimated (min/max) traces. */
  buckets: z.number().int().min(10).max(10_000).default(1000),
});
export type SimulationRequest = z.output<typeof simulationRequestSchema>;
export type SimulationRequestInput = z.input<typeof simulationRequestSchema>;

/** An unsaved spec simulated as it is (POST /api/simulations). */
export const specSimulationRequestSchema = simulationRequestSchema.extend({ spec: loopSpecSchema });
export type SpecSimulationRequestInput = z.input<typeof specSimulationRequestSchema>;

export interface SimulationResponse {
  readonly scenario: SimulationRequest['scenario'];
  readonly simulation: SimResult;
  readonly designId?: number;
  readonly revision?: number;
}

/** An unsaved spec's acquisition figures (POST /api/acquisitions); a stored design's takes no body. */
export const acquisitionRequestSchema = z.strictObject({ spec: loopSpecSchema });

/** Each acquisition figure as estimate and as measured by simulation (dsp compareAcquisition). */
export interface AcquisitionResponse {
  readonly acquisition: AcquisitionComparison;
  readonly designId?: number;
  readonly revision?: number;
}

/**
 * Asked for with `Accept: application/x-ndjson`, the acquisition routes answer one JSON object per
 * line: progress lines while the search runs, then the result or the error (the status is already 200
 * by then). Closing the connection cancels the search.
 */
export const ACQUISITION_STREAM_TYPE = 'application/x-ndjson';
export type AcquisitionStreamLine =
  | { readonly type: 'progress'; readonly fraction: number }
  | ({ readonly type: 'result' } & AcquisitionResponse)
  | { readonly type: 'error'; readonly error: { readonly code: string; readonly message: string; readonly field?: string } };
