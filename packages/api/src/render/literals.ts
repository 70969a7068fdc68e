/**
 * Integer literals that each target language reads back exactly.
 *
 * Codes are bigint so 64-bit NCO tuning words and accumulator limits survive (a JS number holds
 * integers exactly only up to 2^53). Rules per language:
 * - VHDL: `integer` is only guaranteed to 32 bits (IEEE 1076-2008 §5.2.3.1, section number from memory, asks for at least
 *   −2^31+1 … 2^31−1), so every code is a `signed`/`unsigned` vector written as a binary bit-string
 *   literal of exactly its width; small widths and counts stay `natural`.
 * - Verilog: sized literals (IEEE 1800-2012 §5.7.1, memory): `18'sd5`, `-18'sd5`; the most negative value has
 *   no positive twin of the same width, so it is written as its bit pattern `18'sb100…0`.
 * - C: stdint types and the INTn_C/UINTn_C macros (C11 §7.20.4, memory); those macros take an unsuffixed
 *   constant, so negatives are `(-INT32_C(5))` and the type minimum is `(-INT64_C(2^63−1) - 1)`.
 */

export type Signedness = 'signed' | 'unsigned';

/** Converts a number or bigint to bigint, refusing anything that is not an exact integer. */
export function toCode(value: number | bigint): bigint {
  if (typeof value === 'bigint') return value;
  if (!Number.isSafeInteger(value)) {
    throw new RangeError(`integer code ${value} is not a safe integer; pass it as a bigint`);
  }
  return BigInt(value);
}

/** Smallest and largest code of a word (two's complement when signed). */
export function codeRange(signedness: Signedness, widthBits: number): { min: bigint; max: bigint } {
  if (!Number.isInteger(widthBits) || widthBits < 1 || widthBits > 64) {
    throw new RangeError(`width ${widthBits} bits is outside 1..64`);
  }
  const w = BigInt(widthBits);
  return signedness === 'signed'
    ? { min: -(1n << (w - 1n)), max: (1n << (w - 1n)) - 1n }
    : { min: 0n, max: (1n << w) - 1n };
}

export function assertFits(code: bigint, signedness: Signedness, widthBits: number): void {
  const { min, max } = codeRange(signedness, widthBits);
  if (code < min || code > max) {
    throw new RangeError(`code ${code} does not fit a ${signedness} ${widthBits}-bit word [${min}, ${max}]`);
  }
}

/** Two's-complement bit pattern of exactly widthBits characters, most significant bit first. */
export function bitPattern(code: bigint, signedness: Signedness, widthBits: number): string {
  assertFits(code, signedness, widthBits);
  const w = BigInt(widthBits);
  const raw = code < 0n ? (1n << w) + code : code;
  return raw.toString(2).padStart(widthBits, '0');
}

/** VHDL bit-string literal for a `signed`/`unsigned (W-1 downto 0)` constant. */
export function vhdlLiteral(code: bigint, signedness: Signedness, widthBits: number): string {
  return `"${bitPattern(code, signedness, widthBits)}"`;
}

/** VHDL subtype of the constant, e.g. `signed(17 downto 0)`. */
export function vhdlType(signedness: Signedness, widthBits: number): string {
  return `${signedness}(${widthBits - 1} downto 0)`;
}

/** Verilog sized literal. */
export function verilogLiteral(code: bigint, signedness: Signedness, widthBits: number): string {
  assertFits(code, signedness, widthBits);
  if (signedness === 'unsigned') return `${widthBits}'d${code}`;
  if (code === codeRange('signed', widthBits).min) return `${widthBits}'sb1${'0'.repeat(widthBits - 1)}`;
  return code < 0n ? `-${widthBits}'sd${-code}` : `${widthBits}'sd${code}`;
}

/** Verilog declaration range and signedness, e.g. `signed [17:0]`. */
export function verilogType(signedness: Signedness, widthBits: number): string {
  return `${signedness === 'signed' ? 'signed ' : ''}[${widthBits - 1}:0]`;
}

/** Width of the stdint type that holds a word: 8, 16, 32 or 64. */
export function cStorageBits(widthBits: number): 8 | 16 | 32 | 64 {
  if (widthBits <= 8) return 8;
  if (widthBits <= 16) return 16;
  if (widthBits <= 32) return 32;
  if (widthBits <= 64) return 64;
  throw new RangeError(`width ${widthBits} bits is wider than any stdint type`);
}

export function cType(signedness: Signedness, widthBits: number): string {
  return `${signedness === 'signed' ? 'int' : 'uint'}${cStorageBits(widthBits)}_t`;
}

/** C expression of the code, typed by its stdint constant macro and safe inside any expression. */
export function cLiteral(code: bigint, signedness: Signedness, widthBits: number): string {
  assertFits(code, signedness, widthBits);
  const bits = cStorageBits(widthBits);
  if (signedness === 'unsigned') return `UINT${bits}_C(${code})`;
  const macro = `INT${bits}_C`;
  const typeMin = codeRange('signed', bits).min;
  if (code === typeMin) return `(-${macro}(${-typeMin - 1n}) - 1)`;
  return code < 0n ? `(-${macro}(${-code}))` : `${macro}(${code})`;
}
