import { describe, expect, it } from 'vitest';
import { asciiString, MAX_DECIMAL_BYTES, putDecimal, putHex, putInt32, putText } from '../../src/vectors/asciiText.ts';
import { mulberry32 } from '../reference/random.ts';

// The reference is the language's own number formatting (ECMA262, Number::toString with radix 10
// and 16): the golden-vector files must hold the bytes String(v) and v.toString(16) would write.
function written<T>(values: readonly T[], bytesEach: number, put: (buf: Uint8Array, at: number, v: T) => number): string {
  // One spare byte past the bound of every value, so a writer that passes its bound shows up as a wrong text, not a silent overwrite.
  const buf = new Uint8Array(values.length * (bytesEach + 1));
  let at = 0;
  for (const v of values) {
    at = put(buf, at, v);
    buf[at++] = 0x2c;
  }
  return asciiString(buf.subarray(0, at));
}

describe('ASCII writers', () => {
  const edges = [0, 1, -1, 9, 10, 99, 100, 101, -100, 999, 1000, 2 ** 31 - 1, -(2 ** 31), 2 ** 31, 2 ** 31 + 99, 2 ** 32 - 1, 2 ** 32, 2 ** 32 + 1, 10 ** 16 - 1, 9007199200000000, 9007199199999999, 2 ** 53 - 1, -(2 ** 53 - 1), 10 ** 15, 10 ** 15 - 1];
  const rnd = mulberry32(7);

  it('write safe integers as String(v) does, edges and random widths', () => {
    const values = [...edges, ...Array.from({ length: 300 }, () => Math.floor((rnd() - 0.5) * 2 ** Math.floor(rnd() * 54)))];
    expect(written(values, MAX_DECIMAL_BYTES, putDecimal)).toBe(values.map((v) => `${String(v)},`).join(''));
  });

  it('write signed codes and unsigned words from -2^31 to 2^32 - 1 as String(v) does', () => {
    const values = [...edges.filter((v) => v >= -(2 ** 31) && v < 2 ** 32), ...Array.from({ length: 300 }, () => Math.floor(rnd() * 2 ** 32) - (rnd() < 0.5 ? 2 ** 31 : 0))];
    expect(written(values, 11, putInt32)).toBe(values.map((v) => `${String(v)},`).join(''));
  });

  it('write unsigned words as toString(16) zero-padded to the digit count', () => {
    const hexRnd = mulberry32(11);
    const words = [0, 1, 15, 16, 255, 0xffff, 2 ** 31, 2 ** 32 - 1, ...Array.from({ length: 200 }, () => Math.floor(hexRnd() * 2 ** 32))];
    for (const digits of [1, 3, 4, 5, 7, 8, 12]) {
      const fit = words.map((w) => (digits >= 8 ? w : w % 16 ** digits));
      expect(written(fit, digits, (buf, at, w) => putHex(buf, at, w, digits))).toBe(fit.map((w) => `${w.toString(16).padStart(digits, '0')},`).join(''));
    }
  });

  it('copy ASCII text as it is', () => {
    expect(written(['sample,input_code', '18446744073709551615'], 20, putText)).toBe('sample,input_code,18446744073709551615,');
  });
});
