/**
 * NCO tuning word (TRG71): an N-bit phase accumulator advanced by M each sample at fs produces
 * f = M·fs/2^N, so M = round(f·2^N/fs), resolution fs/2^N. The rounding is done exactly on the
 * binary values of f and fs (BigInt, set-up only), so 48- and 64-bit words are right to the LSB.
 */
import type { NcoTuning } from '../types/nco.ts';
import { FieldError, requireIntIn } from '../fixed/fieldError.ts';
import { doubleToRational, rationalToNumber, roundRational } from './exactRational.ts';

export const MAX_ACCUMULATOR_BITS = 64;

/** Tuning word, actual frequency and its error for `frequencyHz` at the loop rate `sampleRateHz`. */
export function ncoTuning(frequencyHz: number, sampleRateHz: number, accumulatorBits: number): NcoTuning {
  requireIntIn('nco.accumulatorBits', accumulatorBits, 1, MAX_ACCUMULATOR_BITS);
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) throw new FieldError('sampleRateHz', `sampleRateHz must be a positive finite number, got ${sampleRateHz}`);
  if (!(frequencyHz >= 0) || frequencyHz >= sampleRateHz / 2) {
    throw new FieldError('centerHz', `centerHz must be in [0, sampleRateHz/2 = ${sampleRateHz / 2}), got ${frequencyHz}`);
  }
  const f = doubleToRational(frequencyHz);
  const fs = doubleToRational(sampleRateHz);
  const twoN = 1n << BigInt(accumulatorBits);
  // M = round(f·2^N/fs) with f = fn/fd, fs = sn/sd: (fn·sd·2^N)/(fd·sn).
  const m = roundRational(f.num * fs.den * twoN, f.den * fs.num);
  // error = M·fs/2^N − f = (M·sn·fd − fn·sd·2^N)/(2^N·sd·fd), formed exactly before one conversion.
  const errNum = m * fs.num * f.den - f.num * fs.den * twoN;
  const errorHz = rationalToNumber(errNum, twoN * fs.den * f.den);
  const resolutionHz = sampleRateHz / 2 ** accumulatorBits;
  return {
    accumulatorBits,
    tuningWord: Number(m),
    tuningWordDecimal: m.toString(),
    tuningWordHi: Number(m >> 32n),
    tuningWordLo: Number(m & 0xffffffffn),
    requestedHz: frequencyHz,
    actualHz: frequencyHz + errorHz,
    errorHz,
    errorPpm: frequencyHz === 0 ? 0 : (errorHz / frequencyHz) * 1e6,
    resolutionHz,
  };
}
