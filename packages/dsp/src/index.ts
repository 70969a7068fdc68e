export type * from './types/index.ts';
