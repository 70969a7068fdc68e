export type * from './filter.ts';
export type * from './spec.ts';
export type * from './fixed.ts';
export type * from './nco.ts';
export type * from './sim.ts';
export type * from './analysis.ts';
export type * from './rtl.ts';
