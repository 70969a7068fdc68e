/**
 * The reference-RTL checks: the verification record (the release's testbenches under GHDL and Icarus)
 * and the resource estimate (yosys).
 */
import { z } from 'zod';
import { mismatchSchema } from './common.ts';

export const SIMULATORS = ['ghdl', 'icarus'] as const;
export const simulatorSchema = z.enum(SIMULATORS);
export type Simulator = z.infer<typeof simulatorSchema>;

/** pass: PASS line and exit 0; fail: FAIL line (a mismatch); error: no verdict (compile error, timeout); not-run: not installed. */
export const simulatorVerdictSchema = z.enum(['pass', 'fail', 'error', 'not-run']);
export type SimulatorVerdict = z.infer<typeof simulatorVerdictSchema>;

export const simulatorRunSchema = z.object({
  simulator: simulatorSchema,
  /** "GHDL", "Icarus": the names the summary uses. */
  label: z.string(),
  /** The tool's own version line; null when it is not installed. */
  version: z.string().nullable(),
  verdict: simulatorVerdictSchema,
  /** Samples compared, when it passed. */
  samples: z.number().int().nullable(),
  mismatch: mismatchSchema.nullable(),
  durationMs: z.number().int(),
  /** The testbench's verdict line, or why there is none. */
  detail: z.string(),
});
export type SimulatorRun = z.infer<typeof simulatorRunSchema>;

/** passed: every simulator passed; failed: any failed or gave no verdict; partial: some passed, the rest not installed; not-run: none installed. */
export const rtlVerdictSchema = z.enum(['passed', 'failed', 'partial', 'not-run']);
export type RtlVerdict = z.infer<typeof rtlVerdictSchema>;

export const rtlVerificationSchema = z.object({
  verdict: rtlVerdictSchema,
  /** Samples each testbench was asked to replay. */
  samples: z.number().int(),
  /** Samples in the release's golden vectors, of which `samples` were replayed (absent in records made before the testbenches replayed a prefix: they replayed all). */
  recordSamples: z.number().int().optional(),
  runs: z.array(simulatorRunSchema),
  /** One sentence for the release page, the review page and the review e-mail. */
  summary: z.string(),
});
export type RtlVerification = z.infer<typeof rtlVerificationSchema>;

const count = () => z.number().int().min(0);
export const genericResourcesSchema = z.object({ luts: count(), flipFlops: count(), multipliers: count(), romBits: count() });
export const ice40ResourcesSchema = z.object({ luts: count(), flipFlops: count(), carries: count(), dspBlocks: count(), ramBlocks: count() });
export type GenericResources = z.infer<typeof genericResourcesSchema>;
export type Ice40Resources = z.infer<typeof ice40ResourcesSchema>;

export const resourcePartSchema = z.object({
  /** "nco", "detector", "section 0" …, "top" (the loop's own registers and glue). */
  part: z.string(),
  instance: z.string(),
  generic: genericResourcesSchema,
  ice40: ice40ResourcesSchema,
});
export type ResourcePart = z.infer<typeof resourcePartSchema>;

export const resourceEstimateSchema = z.discriminatedUnion('state', [
  z.object({
    state: z.literal('estimated'),
    /** yosys's version line. */
    tool: z.string(),
    /** What the figures are (and are not): shown beside them everywhere. */
    label: z.string(),
    parts: z.array(resourcePartSchema),
    total: z.object({ generic: genericResourcesSchema, ice40: ice40ResourcesSchema }),
    durationMs: z.number().int(),
  }),
  z.object({ state: z.literal('not-estimated'), reason: z.string() }),
]);
export type ResourceEstimate = z.infer<typeof resourceEstimateSchema>;

export const VERIFICATION_STATES = ['queued', 'running', 'done'] as const;

/** A release's verification record as the API returns it (GET /api/releases/:id and …/verification). */
export const releaseVerificationSchema = z.object({
  state: z.enum(VERIFICATION_STATES),
  /** What the job is doing now (while queued or running). */
  progress: z.string().nullable(),
  /** The simulations' verdict, once they finished (the estimate may still be running). */
  verdict: rtlVerdictSchema.nullable(),
  /** The sentence the release page, the review page and the review e-mail show. */
  summary: z.string(),
  verification: rtlVerificationSchema.nullable(),
  estimate: resourceEstimateSchema.nullable(),
  attempts: z.number().int(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  /** Reviewers may approve only when the simulations finished and none failed. */
  approvable: z.boolean(),
  /** Why not, when approvable is false. */
  blockedReason: z.string().nullable(),
});
export type ReleaseVerificationRecord = z.infer<typeof releaseVerificationSchema>;

/** The word-length search asks for the cost of up to this many candidate specs at once. */
export const ESTIMATE_REQUEST_MAX_SPECS = 40;

export const estimateRequestSchema = z.strictObject({
  /** Candidate specs (each validated on its own: a bad one is answered "invalid", naming its field). */
  specs: z.array(z.unknown()).min(1).max(ESTIMATE_REQUEST_MAX_SPECS),
});
export type EstimateRequest = z.infer<typeof estimateRequestSchema>;

/** The cost of one candidate: yosys's totals, pending (queued for a worker; ask again), or why none. */
export const candidateEstimateSchema = z.discriminatedUnion('state', [
  z.object({ state: z.literal('estimated'), tool: z.string(), label: z.string(), total: z.object({ generic: genericResourcesSchema, ice40: ice40ResourcesSchema }) }),
  z.object({ state: z.literal('pending') }),
  z.object({ state: z.literal('not-estimated'), reason: z.string() }),
  z.object({ state: z.literal('invalid'), field: z.string(), message: z.string() }),
]);
export type CandidateEstimate = z.infer<typeof candidateEstimateSchema>;
export const estimateResponseSchema = z.object({ estimates: z.array(candidateEstimateSchema) });
export type EstimateResponse = z.infer<typeof estimateResponseSchema>;
