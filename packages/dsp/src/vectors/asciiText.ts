/**
 * ASCII text written byte by byte into one preallocated buffer: decimal and hex integers written as
 * digits straight into it, with no string per value. The golden-vector CSV and the $readmemh files
 * hold hundreds of thousands of integers (65 536 samples × 6 columns), and a template string or a
 * toString per cell was most of a release cut's time (packages/dsp/bench/bench.ts, "goldenVectors").
 * Every value written is an exact integer, so the bytes are those of String(v) / v.toString(16).
 *
 * The writers are plain functions over (buffer, position) returning the position after what they
 * wrote, so a long file's loop keeps both in locals and hands its bytes on as they are: the CSV of
 * 65 536 rows took 22–27 ms of CPU through an object's methods, a string and its UTF-8 encoding, and
 * takes 9–10 ms as bytes written this way (same bytes; median of 30, load average 3 on 2 cores).
 * The caller sizes the buffer for the longest text it can write; nothing here checks or grows it.
 */

const ZERO = 0x30;
const MINUS = 0x2d;
const HEX_DIGITS = Uint8Array.from('0123456789abcdef', (c) => c.charCodeAt(0));
/** "00".."ff" as byte pairs, as DIGIT_PAIRS for decimal. */
const HEX_PAIRS = Uint8Array.from({ length: 512 }, (_, i) => HEX_DIGITS[i & 1 ? (i >> 1) & 15 : i >> 5] as number);
/** "00".."99" as byte pairs: two digits per division halves the divisions of a long number. */
const DIGIT_PAIRS = Uint8Array.from({ length: 200 }, (_, i) => ZERO + (i & 1 ? Math.floor(i / 2) % 10 : Math.floor(i / 20)));

/** Bytes `putDecimal` may write: a sign and the 16 digits of 2^53 − 1. */
export const MAX_DECIMAL_BYTES = 17;

/** Decimal digits of 0 ≤ v < 2^32. */
function digitCount32(v: number): number {
  if (v < 100000) return v < 100 ? (v < 10 ? 1 : 2) : v < 1000 ? 3 : v < 10000 ? 4 : 5;
  return v < 10000000 ? (v < 1000000 ? 6 : 7) : v < 100000000 ? 8 : v < 1000000000 ? 9 : 10;
}

/**
 * 0 ≤ v < 2^32 in decimal, its last digit at end − 1, written backwards a pair at a time. Below 2^31
 * (v / 100) | 0 is an int32 division by a constant, which the JavaScript engine compiles to a multiply and shifts; the
 * one step above it divides doubles, (v / 100) >>> 0 being floor(v / 100) there: the quotient is
 * correctly rounded, and for an integer v it lies at least 0.01 below the next integer, far more
 * than its rounding error.
 */
function putDigits32(buf: Uint8Array, end: number, v: number): void {
  let p = end;
  if (v >= 2147483648) {
    const q = (v / 100) >>> 0;
    const pair = (v - q * 100) << 1;
    buf[--p] = DIGIT_PAIRS[pair + 1] as number;
    buf[--p] = DIGIT_PAIRS[pair] as number;
    v = q;
  }
  let x = v | 0;
  while (x >= 100) {
    const q = (x / 100) | 0;
    const pair = (x - q * 100) << 1;
    buf[--p] = DIGIT_PAIRS[pair + 1] as number;
    buf[--p] = DIGIT_PAIRS[pair] as number;
    x = q;
  }
  if (x >= 10) {
    buf[--p] = DIGIT_PAIRS[(x << 1) + 1] as number;
    buf[--p] = DIGIT_PAIRS[x << 1] as number;
  } else buf[--p] = ZERO + x;
}

/** 0 ≤ v < 2^32 in decimal at `at`, as String(v) writes it; returns the position after it. */
export function putUint32(buf: Uint8Array, at: number, v: number): number {
  const end = at + digitCount32(v);
  putDigits32(buf, end, v);
  return end;
}

/** −2^31 ≤ v < 2^32 in decimal at `at` (a signed code or an unsigned word), as String(v) writes it. */
export function putInt32(buf: Uint8Array, at: number, v: number): number {
  if (v >= 0) return putUint32(buf, at, v);
  buf[at] = MINUS;
  return putUint32(buf, at + 1, -v);
}

const TEN_8 = 100000000;

/**
 * A safe integer (|v| ≤ 2^53 − 1) in decimal at `at`, as String(v) writes it; returns the position
 * after it. Past 2^32 it is split into v = q·10^8 + r: q·10^8 and the difference are exact in doubles
 * (both are integers below 2^54 whose low 8 bits are zero, or below 10^8), and the correction step
 * catches a floor(v / 10^8) that rounding lifted by one near a multiple of 10^8.
 */
export function putDecimal(buf: Uint8Array, at: number, v: number): number {
  if (v < 0) {
    buf[at++] = MINUS;
    v = -v;
  }
  if (v < 4294967296) return putUint32(buf, at, v);
  let q = Math.floor(v / TEN_8);
  let r = v - q * TEN_8;
  if (r < 0) {
    q -= 1;
    r += TEN_8;
  }
  const end = putUint32(buf, at, q) + 8;
  // r's eight digits, zero-padded: the two bytes of each pair, lowest pair last.
  let p = end;
  for (let k = 0; k < 4; k++) {
    const rq = (r / 100) >>> 0;
    const pair = (r - rq * 100) << 1;
    buf[--p] = DIGIT_PAIRS[pair + 1] as number;
    buf[--p] = DIGIT_PAIRS[pair] as number;
    r = rq;
  }
  return end;
}

/** An unsigned word 0 ≤ v < 2^32 as exactly `digits` lower-case hex digits (zero-padded on the left) at `at`. */
export function putHex(buf: Uint8Array, at: number, v: number, digits: number): number {
  let x = v >>> 0;
  const end = at + digits;
  let p = end;
  // Two digits (one byte of v) per step from the byte-pair table, the odd leading digit alone.
  while (p - at >= 2) {
    const pair = (x & 255) << 1;
    buf[--p] = HEX_PAIRS[pair + 1] as number;
    buf[--p] = HEX_PAIRS[pair] as number;
    x >>>= 8;
  }
  if (p > at) buf[at] = HEX_DIGITS[x & 15] as number;
  return end;
}

/** ASCII text as it is (a header line, a BigInt's digits) at `at`. */
export function putText(buf: Uint8Array, at: number, s: string): number {
  for (let i = 0; i < s.length; i++) buf[at + i] = s.charCodeAt(i);
  return at + s.length;
}

/** The bytes of a text as a string. */
export function asciiString(bytes: Uint8Array): string {
  return UTF8.decode(bytes);
}

/**
 * ASCII is valid UTF-8 with one character per byte, and the UTF-8 decoder has an ASCII fast path:
 * 2.4–4.7 ms for 2.9 MB here, against 2.6–7.7 ms for 'latin1' (which WHATWG maps to windows-1252)
 * and 22–31 ms for String.fromCharCode over 8 KiB chunks.
 */
const UTF8 = new TextDecoder('utf-8');
