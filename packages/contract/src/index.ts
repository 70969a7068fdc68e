/**
 * @loopwright/contract: every request and response schema of the API and the vocabulary the API and
 * the app share. Pure zod and the dsp spec schema, nothing node-only (test/browserSafe.test.ts), so
 * the browser bundle parses responses with the same schemas the server validates requests with.
 */
export * from './vocabulary.ts';
export * from './common.ts';
export * from './health.ts';
export * from './accounts.ts';
export * from './projects.ts';
export * from './designs.ts';
export * from './analysis.ts';
export * from './audit.ts';
export * from './releases.ts';
export * from './rtl.ts';
