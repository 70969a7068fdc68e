/**
 * The NCO's output spectrum at the spec's centre frequency: the phase accumulator advanced by the
 * tuning word (TRG71), its top phaseBits addressing the sine table, as the bit-true loop and the RTL
 * run it, then a Blackman–Harris-windowed FFT (Ha78) normalised to the carrier (dBc). The phase-
 * truncation spur estimate (NS87) is returned beside it, so the plot can show where theory puts it.
 */
import type { LoopSpec } from '../spec/schema.ts';
import { ncoSpectralEstimates } from './spectralEstimates.ts';
import { sineTable } from './sineTable.ts';
import { ncoTuning } from './tuningWord.ts';
import { fftInPlace } from './fft.ts';

export interface NcoSpectrum {
  /** k·fs/points for k = 0 … points/2. */
  readonly freqHz: readonly number[];
  /** Level of each bin relative to the carrier's bin, dB (floored at SPECTRUM_FLOOR_DBC). */
  readonly levelDbc: readonly number[];
  readonly toneHz: number;
  readonly points: number;
  readonly spurEstimateDbc: number | null;
  readonly spurWorstDbc: number | null;
  /** Highest bin more than SPUR_GUARD_BINS from the carrier, the measured counterpart of the estimate. */
  readonly largestSpur: { readonly freqHz: number; readonly levelDbc: number } | null;
}

export const SPECTRUM_FLOOR_DBC = -200;
/** Bins either side of the carrier that belong to the window's main lobe (4-term Blackman–Harris: ±4, Ha78) plus one. */
const SPUR_GUARD_BINS = 5;

/** The 4-term Blackman–Harris window, periodic form (Ha78; SciPy's blackmanharris(N, sym=False)). */
export function blackmanHarris(n: number): Float64Array {
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = (2 * Math.PI * i) / n;
    w[i] = 0.35875 - 0.48829 * Math.cos(x) + 0.14128 * Math.cos(2 * x) - 0.01168 * Math.cos(3 * x);
  }
  return w;
}

/** The first `points` table codes the NCO outputs from phase 0 with tuning word M. */
export function ncoOutputCodes(nco: LoopSpec['nco'], tuningWord: bigint, points: number): Int32Array {
  const table = sineTable(nco.phaseBits, nco.amplitudeBits);
  const shift = BigInt(nco.accumulatorBits - nco.phaseBits);
  const mask = (1n << BigInt(nco.accumulatorBits)) - 1n;
  const out = new Int32Array(points);
  let phase = 0n;
  for (let i = 0; i < points; i++) {
    out[i] = table[Number(phase >> shift)]!;
    phase = (phase + tuningWord) & mask;
  }
  return out;
}

export function ncoSpectrum(spec: Pick<LoopSpec, 'centerHz' | 'sampleRateHz' | 'nco'>, points = 8192): NcoSpectrum {
  const { nco } = spec;
  const tuning = ncoTuning(spec.centerHz, spec.sampleRateHz, nco.accumulatorBits);
  const codes = ncoOutputCodes(nco, BigInt(tuning.tuningWordDecimal), points);
  const window = blackmanHarris(points);
  const re = new Float64Array(points);
  const im = new Float64Array(points);
  for (let i = 0; i < points; i++) re[i] = codes[i]! * window[i]!;
  fftInPlace(re, im);
  const bins = points / 2 + 1;
  const power = Array.from({ length: bins }, (_, k) => re[k]! * re[k]! + im[k]! * im[k]!);
  let carrier = 0;
  for (let k = 1; k < bins; k++) if (power[k]! > power[carrier]!) carrier = k;
  const ref = power[carrier]!;
  const levelDbc = power.map((p) => (p > 0 && ref > 0 ? Math.max(10 * Math.log10(p / ref), SPECTRUM_FLOOR_DBC) : SPECTRUM_FLOOR_DBC));
  let spur = -1;
  for (let k = 0; k < bins; k++) if (Math.abs(k - carrier) > SPUR_GUARD_BINS && (spur < 0 || levelDbc[k]! > levelDbc[spur]!)) spur = k;
  const estimates = ncoSpectralEstimates(nco.accumulatorBits, nco.phaseBits, nco.amplitudeBits);
  const binHz = spec.sampleRateHz / points;
  return {
    freqHz: Array.from({ length: bins }, (_, k) => k * binHz),
    levelDbc,
    toneHz: tuning.actualHz,
    points,
    spurEstimateDbc: estimates.phaseTruncationSpurDbc,
    spurWorstDbc: estimates.phaseTruncationSpurWorstDbc,
    largestSpur: spur >= 0 ? { freqHz: spur * binHz, levelDbc: levelDbc[spur]! } : null,
  };
}
