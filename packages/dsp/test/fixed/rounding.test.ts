import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyOverflow, roundReal, roundShift } from '../../src/fixed/rounding.ts';
import { quantizeValue, autoFractionBits } from '../../src/fixed/qformat.ts';
import { python } from './python.ts';

// IEEE754 cl. 4.3 rounding-direction attributes: "nearest" = roundTiesToAway, "half-even" =
// roundTiesToEven, "truncate" = roundTowardNegative. The tie table is the standard's own definition
// (values exactly halfway go away from zero / to the even neighbour; toward −∞ is floor).
const TABLE: ReadonlyArray<[number, number, number, number]> = [
  // value, tiesToAway, tiesToEven, towardNegative
  [2.5, 3, 2, 2],
  [-2.5, -3, -2, -3],
  [0.5, 1, 0, 0],
  [-0.5, -1, -0, -1],
  [1.5, 2, 2, 1],
  [-1.5, -2, -2, -2],
  [3.5, 4, 4, 3],
  [-3.7, -4, -4, -4],
  [2.2, 2, 2, 2],
  [-2.2, -2, -2, -3],
];

describe('rounding modes (IEEE754 cl. 4.3 attributes)', () => {
  it.each(TABLE)('rounds %d as tiesToAway %d, tiesToEven %d, towardNegative %d', (v, away, even, down) => {
    expect(roundReal(v, 'nearest')).toBe(away);
    expect(roundReal(v, 'half-even') + 0).toBe(even + 0);
    expect(roundReal(v, 'truncate')).toBe(down);
  });

  it('rounds an integer shifted right the same way as the real quotient', () => {
    // p / 2^s for ties: −5/2 = −2.5, 5/2, −3/2, 3/2, and a non-tie −7/4 = −1.75
    for (const [p, s] of [[-5, 1], [5, 1], [-3, 1], [3, 1], [-7, 2], [13, 3], [-13, 3]] as const) {
      for (const mode of ['nearest', 'half-even', 'truncate'] as const) {
        expect(roundShift(p, s, mode)).toBe(roundReal(p / 2 ** s, mode) + 0);
      }
    }
  });

  it("matches Python's decimal ROUND_HALF_UP / ROUND_HALF_EVEN / ROUND_FLOOR on a batch", () => {
    // Python decimal: ROUND_HALF_UP rounds ties away from zero, ROUND_HALF_EVEN to even, ROUND_FLOOR
    // toward −∞ (Python docs, decimal module). Inputs are k/8 so many are exact ties.
    const values = Array.from({ length: 400 }, (_, k) => (k - 200) / 8 + (k % 7 === 0 ? 1 / 1024 : 0));
    const ref = python<number[][]>(
      `from decimal import Decimal, ROUND_HALF_UP, ROUND_HALF_EVEN, ROUND_FLOOR
out = [[int(Decimal(v).quantize(Decimal(1), rounding=m)) for v in data] for m in (ROUND_HALF_UP, ROUND_HALF_EVEN, ROUND_FLOOR)]`,
      values,
    );
    const modes = ['nearest', 'half-even', 'truncate'] as const;
    modes.forEach((mode, i) => {
      expect(values.map((v) => roundReal(v, mode) + 0)).toEqual(ref[i]);
    });
  });

  it('is exact for 52-bit integers shifted right (ties detected without float rounding)', () => {
    const p = 2 ** 52 - 1; // odd, so /2 is a tie at 2^51 − 0.5
    expect(roundShift(p, 1, 'nearest')).toBe(2 ** 51);
    expect(roundShift(p, 1, 'half-even')).toBe(2 ** 51);
    expect(roundShift(p - 2, 1, 'half-even')).toBe(2 ** 51 - 2);
    expect(roundShift(-p, 1, 'truncate')).toBe(-(2 ** 51));
  });
});

describe('overflow', () => {
  it('saturates to the word range and wraps modulo 2^W (two’s complement)', () => {
    // 8-bit word: [−128, 127]; 130 wraps to 130 − 256 = −126, −129 to 127 (modular arithmetic).
    expect(applyOverflow(130, 8, 'saturate')).toBe(127);
    expect(applyOverflow(-129, 8, 'saturate')).toBe(-128);
    expect(applyOverflow(130, 8, 'wrap')).toBe(-126);
    expect(applyOverflow(-129, 8, 'wrap')).toBe(127);
    expect(applyOverflow(256 + 5, 8, 'wrap')).toBe(5);
    expect(applyOverflow(-100, 8, 'wrap')).toBe(-100);
  });

  it('wrap agrees with BigInt.asIntN for random values', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 40 }), fc.maxSafeInteger(), (bits, v) => {
        expect(applyOverflow(v, bits, 'wrap')).toBe(Number(BigInt.asIntN(bits, BigInt(v))));
      }),
    );
  });
});

describe('quantiser', () => {
  it('round-trips any in-range value within one LSB (half an LSB for the nearest modes)', () => {
    // Quantiser round-trip property (common practice, no source; liquid-dsp tests the same within one LSB).
    fc.assert(
      fc.property(
        fc.integer({ min: 4, max: 32 }),
        fc.integer({ min: 0, max: 30 }),
        fc.double({ min: -1, max: 1, noNaN: true }),
        fc.constantFrom('nearest', 'half-even', 'truncate' as const),
        (wordBits, fractionBits, unit, rounding) => {
          const f = Math.min(fractionBits, wordBits - 1);
          const limit = 2 ** (wordBits - f - 1) - 2 ** -f;
          const value = unit * limit;
          const q = quantizeValue(value, wordBits, f, rounding, 'saturate');
          const lsb = 2 ** -f;
          expect(q.overflowed).toBe(false);
          expect(Math.abs(q.quantizedValue - value)).toBeLessThanOrEqual(rounding === 'truncate' ? lsb : lsb / 2);
          if (rounding === 'truncate') expect(q.quantizedValue).toBeLessThanOrEqual(value);
        },
      ),
    );
  });

  it('chooses "auto" fraction bits as the most that still hold every coefficient', () => {
    // 18-bit word: −1.9999 needs range [−2, 2) → F = 16; 0.9 alone → F = 17 ([−1, 1)).
    expect(autoFractionBits([-1.9999, 0.5], 18, 'nearest')).toBe(16);
    expect(autoFractionBits([0.9], 18, 'nearest')).toBe(17);
    // 1 − 2^−18 rounds up to 1.0 at F = 17 (code 131072 > 131071), so only F = 16 holds it.
    expect(autoFractionBits([1 - 2 ** -18], 18, 'nearest')).toBe(16);
    expect(autoFractionBits([1 - 2 ** -18], 18, 'truncate')).toBe(17);
    expect(autoFractionBits([-1], 18, 'nearest')).toBe(17);
    expect(autoFractionBits([300], 8, 'nearest')).toBeNull();
  });
});

describe('hot-loop rounding', () => {
  it('roundScaled(p·2^−s) equals roundShift(p, s) for exact integers up to 2^52', async () => {
    // The bit-true kernel rounds t = p·2^−s with t ± 0.5 (exact for |p| < 2^52); roundShift is the
    // remainder-based definition of the README. They must agree everywhere, ties included.
    const { roundScaled, MODE } = await import('../../src/sim/bitTrueKernel.ts');
    fc.assert(
      fc.property(
        fc.integer({ min: -(2 ** 40), max: 2 ** 40 }),
        fc.integer({ min: 0, max: 2 ** 11 }),
        fc.integer({ min: 1, max: 12 }),
        fc.constantFrom('nearest', 'half-even' as const),
        (hiPart, lowPart, s, mode) => {
          const p = hiPart * 2 ** 11 + lowPart; // dense in ties at small s
          expect(roundScaled(p * 2 ** -s, MODE[mode]) + 0).toBe(roundShift(p, s, mode) + 0);
        },
      ),
      { numRuns: 2000 },
    );
  });
});
