/** Spec types, inferred from the zod schema in src/spec/schema.ts (the single source of truth). */
export type {
  LoopSpec,
  LoopSpecInput,
  ValidSpec,
  LoopFilterSpec,
  FilterKind,
  RippleFilterSpec,
  FixedPointSpec,
  NcoSpec,
  SpecIssue,
  SpecWarning,
  ParseLoopSpecResult,
} from '../spec/schema.ts';
export type { ExampleSpec } from '../spec/examples.ts';
export type { LoopGain } from '../analysis/loopGain.ts';
export type { TimeConstants } from '../filters/timeConstants.ts';
