/**
 * The Lyapunov solves build their linear system from the map of each unit symmetric matrix E_kl; the
 * unit images computed from the few terms of E_kl that are not zero (discreteUnitImage,
 * continuousUnitImage) must be the doubles of the full maps (discreteMap: x − A·x·Aᵀ, continuousMap:
 * A·x + x·Aᵀ) at every entry the system reads (i ≤ j), bit for bit (Object.is, so a −0 counts), on random
 * finite matrices that hold zeros and −0 as well as numbers of every size. The solves themselves are
 * checked against SciPy in noiseBandwidthExact.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { continuousMap, continuousUnitImage, discreteMap, discreteUnitImage } from '../../src/analysis/lyapunov.ts';
import { logUniform, mulberry32, uniform } from '../reference/random.ts';

function randomMatrix(rnd: () => number, n: number): Float64Array {
  return Float64Array.from({ length: n * n }, () => {
    const r = rnd();
    if (r < 0.2) return 0;
    if (r < 0.3) return -0;
    return uniform(rnd, -1, 1) * logUniform(rnd, 1e-150, 1e150);
  });
}

function unit(n: number, k: number, l: number): Float64Array {
  const e = new Float64Array(n * n);
  e[k * n + l] = 1;
  e[l * n + k] = 1;
  return e;
}

function expectUpperEqual(actual: Float64Array, expected: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) if (!Object.is(actual[i * n + j], expected[i * n + j])) expect([i, j, actual[i * n + j]]).toEqual([i, j, expected[i * n + j]]);
}

describe('unit images of the Lyapunov maps', () => {
  const rnd = mulberry32(41);
  const cases = Array.from({ length: 60 }, (_, c) => ({ n: 1 + (c % 9), a: randomMatrix(rnd, 1 + (c % 9)) }));

  it('discreteUnitImage is E_kl − A·E_kl·Aᵀ as discreteMap computes it', () => {
    for (const { n, a } of cases) {
      for (let k = 0; k < n; k++) {
        for (let l = k; l < n; l++) {
          const full = new Float64Array(n * n);
          discreteMap(a, n, unit(n, k, l), full, new Float64Array(n * n));
          const image = new Float64Array(n * n);
          discreteUnitImage(a, n, k, l, image);
          expectUpperEqual(image, full, n);
        }
      }
    }
  });

  it('continuousUnitImage is A·E_kl + E_kl·Aᵀ as continuousMap computes it', () => {
    for (const { n, a } of cases) {
      for (let k = 0; k < n; k++) {
        for (let l = k; l < n; l++) {
          const full = new Float64Array(n * n);
          continuousMap(a, n, unit(n, k, l), full);
          const image = new Float64Array(n * n);
          continuousUnitImage(a, n, k, l, image);
          expectUpperEqual(image, full, n);
        }
      }
    }
  });
});
