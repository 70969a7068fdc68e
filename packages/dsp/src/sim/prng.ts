/**
 * Seeded noise for simulations: mulberry32 (a small 32-bit generator, public domain; memory) for
 * uniforms and the Box–Muller transform for Gaussian pairs. Deterministic across engines: only
 * Math.imul, shifts and one division by 2^32, so a seed reproduces the same noise everywhere.
 */

export interface GaussianSource {
  /** Fill `out[0..count)` with independent N(0, sigma²) samples. */
  fill(out: Float64Array, count: number, sigma: number): void;
}

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Box–Muller: two uniforms u1 ∈ (0, 1], u2 give r = √(−2 ln u1), and r·cos(2πu2), r·sin(2πu2). */
export function gaussianSource(seed: number): GaussianSource {
  const uniform = mulberry32(seed);
  let spare = 0;
  let hasSpare = false;
  return {
    fill(out, count, sigma) {
      for (let i = 0; i < count; i++) {
        if (hasSpare) {
          out[i] = spare * sigma;
          hasSpare = false;
          continue;
        }
        const u1 = 1 - uniform();
        const u2 = uniform();
        const r = Math.sqrt(-2 * Math.log(u1));
        out[i] = r * Math.cos(2 * Math.PI * u2) * sigma;
        spare = r * Math.sin(2 * Math.PI * u2);
        hasSpare = true;
      }
    },
  };
}
