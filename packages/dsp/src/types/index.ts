export type * from './filter.ts';
