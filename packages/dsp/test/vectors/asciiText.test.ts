import { describe, expect, it } from 'vitest';
import { AsciiText } from '../../src/vectors/asciiText.ts';
import { mulberry32 } from '../reference/random.ts';

// The reference is the language's own number formatting (ECMA-262, Number::toString with radix 10
// and 16): the golden-vector files must hold the bytes String(v) and v.toString(16) would write.
const written = (write: (t: AsciiText) => void, capacity = 1) => {
  const t = new AsciiText(capacity);
  write(t);
  return t.toString();
};

describe('AsciiText', () => {
  const edges = [0, 1, -1, 9, 10, 99, 100, 101, -100, 999, 1000, 2 ** 31 - 1, -(2 ** 31), 2 ** 31, 2 ** 31 + 99, 2 ** 32 - 1, 2 ** 32, 2 ** 32 + 1, 10 ** 16 - 1, 9007199200000000, 9007199199999999, 2 ** 53 - 1, -(2 ** 53 - 1), 10 ** 15, 10 ** 15 - 1];

  it('writes safe integers as String(v) does, edges and random widths', () => {
    const rnd = mulberry32(7);
    const values = [...edges, ...Array.from({ length: 300 }, () => Math.floor((rnd() - 0.5) * 2 ** Math.floor(rnd() * 54)))];
    // Capacity 1 so the buffer has to grow many times on the way.
    expect(written((t) => values.forEach((v) => (t.decimal(v), t.byte(0x2c))))).toBe(values.map((v) => `${String(v)},`).join(''));
  });

  it('writes unsigned words as toString(16) zero-padded to the digit count', () => {
    const rnd = mulberry32(11);
    const words = [0, 1, 15, 16, 255, 0xffff, 2 ** 31, 2 ** 32 - 1, ...Array.from({ length: 200 }, () => Math.floor(rnd() * 2 ** 32))];
    for (const digits of [1, 3, 4, 5, 7, 8, 12]) {
      const fit = words.map((w) => (digits >= 8 ? w : w % 16 ** digits));
      expect(written((t) => fit.forEach((w) => t.hex(w, digits)))).toBe(fit.map((w) => w.toString(16).padStart(digits, '0')).join(''));
    }
  });

  it('copies ASCII text as it is', () => {
    expect(written((t) => (t.text('sample,input_code'), t.byte(0x0a), t.text('18446744073709551615')))).toBe('sample,input_code\n18446744073709551615');
  });
});
