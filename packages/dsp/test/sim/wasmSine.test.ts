/**
 * The WebAssembly module's sine is a port of the engine's own (FD93); the traced simulation uses it
 * only where it gives Math.sin's doubles, so the reference here is the engine's Math.sin itself.
 */
import { describe, expect, it } from 'vitest';
import { wasmInstanceLoop, releaseWasmBitTrueLoop, WASM_CHUNK_SAMPLES } from '../../src/sim/wasm/wasmKernel.ts';
import { moduleSine, moduleSinePairs } from '../../src/sim/wasm/wasmTraced.ts';
import { mulberry32 } from '../../src/sim/prng.ts';

/**
 * How many of the phases p give a sin(2π·p) or cos(2π·p) other than Math.sin's or Math.cos's (compared
 * as doubles, −0 apart from +0), by the module's sine, its cosine or its two-lane sine (the phases in
 * pairs as they come: neighbours in the smooth sequences, strangers in the random ones).
 */
function mismatches(phases: Float64Array): number {
  const loop = wasmInstanceLoop();
  if (!loop) throw new Error('WebAssembly is not available');
  let bad = 0;
  try {
    for (let k = 0; k < phases.length; k += WASM_CHUNK_SAMPLES) {
      const part = phases.subarray(k, k + WASM_CHUNK_SAMPLES);
      const sin = moduleSine(loop.exports, part);
      const cos = moduleSine(loop.exports, part, true);
      const pairs = moduleSinePairs(loop.exports, part);
      for (let i = 0; i < part.length; i++) {
        const x = 2 * Math.PI * (part[i] as number);
        if (!Object.is(sin[i], Math.sin(x)) || !Object.is(cos[i], Math.cos(x)) || !Object.is(pairs[i], Math.sin(x))) bad++;
      }
    }
  } finally {
    releaseWasmBitTrueLoop(loop);
  }
  return bad;
}

function phases(count: number, seed: number, of: (u: number, i: number) => number): Float64Array {
  const rnd = mulberry32(seed);
  return Float64Array.from({ length: count }, (_, i) => of(rnd(), i));
}

describe('the module sine and cosine', () => {
  // Math.sin and Math.cos are the reference: the engine's own (FD93 in Node's engine).
  it('gives Math.sin(2π·p) and Math.cos(2π·p) for 400 000 phases in [0, 1), the range the simulation reads', () => {
    expect(mismatches(phases(400_000, 1, (u) => u))).toBe(0);
  });

  it('gives Math.sin next to every multiple of π/4 up to 64 turns, where the reduction may cancel', () => {
    expect(mismatches(phases(200_000, 2, (u, i) => (i % 256) / 4 + (u - 0.5) * 2 ** -(20 + (i % 33))))).toBe(0);
  });

  it('gives Math.sin for negative phases, the medium range up to 2^19·π/2 and beyond it (the imported functions)', () => {
    expect(mismatches(phases(100_000, 3, (u) => -u * 3))).toBe(0);
    expect(mismatches(phases(100_000, 4, (u) => (u - 0.5) * 2 ** 18))).toBe(0);
    expect(mismatches(phases(20_000, 5, (u) => (u - 0.5) * 2 ** 40))).toBe(0);
  });

  it('gives Math.sin two lanes at a time along a slowly turning phase, as an NCO gives it (pairs on both sides of every case boundary)', () => {
    expect(mismatches(phases(200_000, 6, (u, i) => (i * 0.00731 + u * 1e-6) % 1))).toBe(0);
  });

  it('gives Math.sin for zeros, tiny, subnormal and non-finite phases', () => {
    expect(mismatches(Float64Array.from([0, -0, 5e-324, -5e-324, 1e-300, 2 ** -30, -(2 ** -28), Infinity, -Infinity, NaN, 0.25, 0.5, 0.75, 1]))).toBe(0);
  });
});
