export type * from './filter.ts';
export type * from './spec.ts';
