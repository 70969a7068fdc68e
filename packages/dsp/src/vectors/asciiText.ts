/**
 * An ASCII text built byte by byte in one preallocated buffer: decimal and hex integers written as
 * digits straight into it, with no string per value. The golden-vector CSV and the $readmemh files
 * hold hundreds of thousands of integers (65 536 samples × 6 columns), and a template string or a
 * toString per cell was most of a release cut's time (packages/dsp/bench/bench.ts, "goldenVectors").
 * Every value it writes is an exact integer, so the bytes are those of String(v) / v.toString(16).
 */

const ZERO = 0x30;
const MINUS = 0x2d;
const HEX_DIGITS = Uint8Array.from('0123456789abcdef', (c) => c.charCodeAt(0));
/** "00".."99" as byte pairs: two digits per division halves the divisions of a long number. */
const DIGIT_PAIRS = Uint8Array.from({ length: 200 }, (_, i) => ZERO + (i & 1 ? Math.floor(i / 2) % 10 : Math.floor(i / 20)));
/** Enough digits for any safe integer (2^53 − 1 has 16). */
const SCRATCH = new Uint8Array(24);

export class AsciiText {
  private bytes: Uint8Array;
  private at = 0;

  /** `capacityBytes` is a first guess; the buffer grows (doubling) when a write would pass it. */
  constructor(capacityBytes: number) {
    this.bytes = new Uint8Array(Math.max(64, capacityBytes));
  }

  private room(n: number): void {
    if (this.at + n <= this.bytes.length) return;
    const grown = new Uint8Array(Math.max(this.bytes.length * 2, this.at + n));
    grown.set(this.bytes.subarray(0, this.at));
    this.bytes = grown;
  }

  /** One byte, by its code (',' = 0x2c, '\n' = 0x0a). */
  byte(code: number): void {
    this.room(1);
    this.bytes[this.at++] = code;
  }

  /** ASCII text as it is (a header line, a BigInt's digits). */
  text(s: string): void {
    this.room(s.length);
    for (let i = 0; i < s.length; i++) this.bytes[this.at++] = s.charCodeAt(i);
  }

  /** A safe integer (|v| ≤ 2^53 − 1) in decimal, as String(v) writes it. */
  decimal(v: number): void {
    this.room(17);
    if (v < 0) {
      this.bytes[this.at++] = MINUS;
      v = -v;
    }
    let n = 0;
    // Below 2^31 the bitwise path; above it, floor division, exact for safe integers.
    while (v >= 100) {
      const q = v < 2147483648 ? ((v / 100) | 0) : Math.floor(v / 100);
      const pair = (v - q * 100) * 2;
      SCRATCH[n++] = DIGIT_PAIRS[pair + 1] as number;
      SCRATCH[n++] = DIGIT_PAIRS[pair] as number;
      v = q;
    }
    if (v >= 10) {
      SCRATCH[n++] = DIGIT_PAIRS[v * 2 + 1] as number;
      SCRATCH[n++] = DIGIT_PAIRS[v * 2] as number;
    } else SCRATCH[n++] = ZERO + v;
    while (n > 0) this.bytes[this.at++] = SCRATCH[--n] as number;
  }

  /** An unsigned word 0 ≤ v < 2^32 as exactly `digits` lower-case hex digits (zero-padded on the left). */
  hex(v: number, digits: number): void {
    this.room(digits);
    let x = v >>> 0;
    for (let d = this.at + digits - 1; d >= this.at; d--) {
      this.bytes[d] = HEX_DIGITS[x & 15] as number;
      x >>>= 4;
    }
    this.at += digits;
  }

  /**
   * The text written so far. ASCII is valid UTF-8 with one character per byte, and the UTF-8 decoder
   * has an ASCII fast path: 2.4–4.7 ms for 2.9 MB here, against 2.6–7.7 ms for 'latin1' (which
   * WHATWG maps to windows-1252) and 22–31 ms for String.fromCharCode over 8 KiB chunks.
   */
  toString(): string {
    return UTF8.decode(this.bytes.subarray(0, this.at));
  }
}

const UTF8 = new TextDecoder('utf-8');
