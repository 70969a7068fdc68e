import { describe, expect, it } from 'vitest';
import {
  bitPattern,
  cLiteral,
  cType,
  codeRange,
  toCode,
  verilogLiteral,
  vhdlLiteral,
} from '../../src/render/literals.ts';

describe('integer literals per language', () => {
  it('gives the two\'s-complement range of a word', () => {
    // Two's complement W bits: [-2^(W-1), 2^(W-1) - 1] (common practice, no source).
    expect(codeRange('signed', 18)).toEqual({ min: -131072n, max: 131071n });
    expect(codeRange('unsigned', 64)).toEqual({ min: 0n, max: 18446744073709551615n });
  });

  it('writes the bit pattern of negative codes in two\'s complement', () => {
    expect(bitPattern(-1n, 'signed', 8)).toBe('11111111');
    expect(bitPattern(-128n, 'signed', 8)).toBe('10000000');
    expect(bitPattern(5n, 'signed', 4)).toBe('0101');
  });

  it('refuses a code that does not fit its word', () => {
    expect(() => vhdlLiteral(131072n, 'signed', 18)).toThrow(/does not fit a signed 18-bit word/);
    expect(() => verilogLiteral(-1n, 'unsigned', 8)).toThrow(/does not fit/);
    expect(() => cLiteral(2n ** 64n, 'unsigned', 64)).toThrow(/does not fit/);
  });

  it('refuses a number that is not an exact integer', () => {
    expect(() => toCode(2 ** 53 + 2)).toThrow(/not a safe integer/);
    expect(() => toCode(0.5)).toThrow(/not a safe integer/);
  });

  it('writes Verilog sized literals, the most negative value as its bit pattern', () => {
    expect(verilogLiteral(-5n, 'signed', 18)).toBe("-18'sd5");
    expect(verilogLiteral(5n, 'signed', 18)).toBe("18'sd5");
    expect(verilogLiteral(-131072n, 'signed', 18)).toBe(`18'sb1${'0'.repeat(17)}`);
    expect(verilogLiteral(2n ** 48n - 1n, 'unsigned', 48)).toBe("48'd281474976710655");
  });

  it('writes C constants with stdint macros and no literal that overflows its type', () => {
    expect(cType('signed', 18)).toBe('int32_t');
    expect(cType('unsigned', 33)).toBe('uint64_t');
    expect(cLiteral(-5n, 'signed', 18)).toBe('(-INT32_C(5))');
    // 9223372036854775808 has no int64_t literal: the minimum is built as -(2^63 - 1) - 1 (C11 §6.4.4.1, memory; gcc warns "integer constant is so large that it is unsigned").
    expect(cLiteral(-(2n ** 63n), 'signed', 64)).toBe('(-INT64_C(9223372036854775807) - 1)');
    expect(cLiteral(7n, 'unsigned', 48)).toBe('UINT64_C(7)');
  });
});
