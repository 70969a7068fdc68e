/**
 * NCO tuning word (TRG71): an N-bit phase accumulator advanced by M each sample at fs produces
 * f = M·fs/2^N, so M = round(f·2^N/fs), resolution fs/2^N. The rounding is done exactly on the
 * binary values of f and fs (BigInt, set-up only), so 48- and 64-bit words are right to the LSB.
 */
import type { NcoTuning } from '../types/nco.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { requireWidth } from '../spec/limits.ts';
import { Fraction, exactFraction } from './exactRational.ts';

/** Tuning word, actual frequency and its error for `frequencyHz` at the loop rate `sampleRateHz`. */
export function ncoTuning(frequencyHz: number, sampleRateHz: number, accumulatorBits: number): NcoTuning {
  requireWidth('nco.accumulatorBits', accumulatorBits);
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) throw new FieldError('sampleRateHz', `sampleRateHz must be a positive finite number, got ${sampleRateHz}`);
  if (!(frequencyHz >= 0) || frequencyHz >= sampleRateHz / 2) {
    throw new FieldError('centerHz', `centerHz must be in [0, sampleRateHz/2 = ${sampleRateHz / 2}), got ${frequencyHz}`);
  }
  const f = exactFraction(frequencyHz);
  const fs = exactFraction(sampleRateHz);
  const twoN = new Fraction(1n << BigInt(accumulatorBits));
  // M = round(f·2^N/fs); f ≥ 0, so fraction.js's half-up is half away from zero.
  const m = f.mul(twoN).div(fs).round().n;
  // error = M·fs/2^N − f, exact before the one conversion. Its denominator is a power of two, so
  // Number(num)/Number(den) rounds once, while den < 2^1024: true for every rate the spec admits
  // (≥ 1e-6 Hz > 2^-20, so den ≤ 2^64·2^72·2^72); only absurdly small rates pass that limit.
  const error = fs.mul(m).div(twoN).sub(f);
  if (error.d >= 1n << 1024n) {
    throw new FieldError('centerHz', `centerHz ${frequencyHz} at sampleRateHz ${sampleRateHz} is too small: its tuning error has no double value`);
  }
  const errorHz = error.valueOf();
  const resolutionHz = sampleRateHz / 2 ** accumulatorBits;
  return {
    accumulatorBits,
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
