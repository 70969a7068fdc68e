export type * from './types/index.ts';
export { loopSpecSchema, parseLoopSpec, specWarnings, loopFilterSchema, rippleFilterSchema, FILTER_KINDS } from './spec/schema.ts';
export { exampleSpecs, exampleSpecByKind, mainsSyncSpec, ultrasonicSinglePoleSpec, ultrasonicLagLeadSpec, ifFmDemodSpec } from './spec/examples.ts';
export { loopGain } from './analysis/loopGain.ts';
export { piFromTargets, lagLeadFromTargets } from './filters/timeConstants.ts';
