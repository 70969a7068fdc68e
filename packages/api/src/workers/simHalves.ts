/**
 * The members of a half of a split simulation (services/compute.ts runSimulation) in the forms they
 * take on the way: encoded by the compute thread, wrapped as EncodedJson on the event loop's thread.
 */
import type { SimResultParts } from '@loopwright/dsp';

/** A simulation's members with its runs and plan as UTF-8 JSON (encodedJson.ts). */
export type EncodedSimParts = SimResultParts<Uint8Array, Uint8Array, Uint8Array>;

/** The parts with each run and the plan passed through `f`, the other members as they are. */
export function mapSimParts<T>(parts: SimResultParts<unknown, unknown, unknown>, f: (member: unknown) => T): SimResultParts<T, T, T> {
  const { float, bitTrue, plan, ...head } = parts;
  return {
    ...head,
    ...(float !== undefined ? { float: f(float) } : {}),
    ...(bitTrue !== undefined ? { bitTrue: f(bitTrue) } : {}),
    ...(plan !== undefined ? { plan: f(plan) } : {}),
  };
}
