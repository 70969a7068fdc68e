/**
 * Roundoff noise and scaling of the bit-true data path (packages/dsp/README.md, "Data-path noise and
 * scaling"). Each rounding point of the arithmetic — the input's quantisation to dataBits, the detector
 * product rounded to dataBits, each section output rounded by the coefficient fraction bits, the tuning
 * increment rounded by the gain shift — adds an error whose mean and variance follow from its mode and
 * the bits it drops (roundoffStatistics; WK08, OS3 Sec. 6.9 (memory)). Treated as independent white
 * sources in the loop linearised about lock (linearLoop), each reaches the filter output and the NCO phase
 * with the noise gain Σh² of the impulse response from that point, and its mean with the DC gain; the
 * contributions add (Ja70). Each section's peak gain from the detector is the L1 norm of that impulse
 * response (the bound for any detector signal within its peak) and the L∞ norm of its frequency response
 * (the bound for a sinusoid), against the section's word: Jackson's Lp scaling (Ja70).
 */
import type { LoopSpec } from '../spec/schema.ts';
import type { Sos } from '../types/filter.ts';
import type { NcoControlScaling } from '../types/nco.ts';
import { roundoffStatistics } from '../fixed/roundoffStatistics.ts';
import { sineFullScale } from '../nco/sineTable.ts';
import { loopGain } from './loopGain.ts';
import { dcGains, impulseNorms, linearLoop, noiseGains, type LinearLoop } from './linearLoop.ts';
import { unitCircleGrid } from './response.ts';

export type RoundoffPointKind = 'input' | 'detector' | 'section' | 'control';

/** One rounding point of the bit-true arithmetic and what its error does at the filter output and the NCO phase. */
export interface RoundoffPoint {
  readonly kind: RoundoffPointKind;
  /** Section index (0-based) for kind "section", else null. */
  readonly section: number | null;
  readonly label: string;
  /** Bits the rounding drops; null for a real value quantised once (the input). */
  readonly droppedBits: number | null;
  /** Value of one LSB of the point's result: control units (input, detector, sections) or radians of NCO phase (control). */
  readonly lsb: number;
  readonly lsbUnit: 'units' | 'rad';
  readonly meanLsb: number;
  readonly varianceLsb2: number;
  readonly powerLsb2: number;
  /** Σh² from the point to the filter output, units² per lsbUnit² (for the input: times the NCO output's mean square). */
  readonly outputNoiseGain: number;
  /** Σh² from the point to the NCO phase, rad² per lsbUnit². */
  readonly phaseNoiseGain: number;
  /** This point's share of the filter output's noise variance (units²) and of the NCO phase's (rad²). */
  readonly outputVariance: number;
  readonly phaseVarianceRad2: number;
  /** The offset its mean leaves at the filter output (units) and in the NCO phase (rad). */
  readonly outputMean: number;
  readonly phaseMeanRad: number;
}

/** Peak gain from the detector to one section output and the headroom left in the section's word. */
export interface SectionScaling {
  readonly section: number;
  /** Σ|h[n]|: the largest output per unit of detector peak, whatever the detector signal (Ja70). */
  readonly l1Gain: number;
  /** √Σh²: RMS output per unit RMS of white detector noise. */
  readonly l2Gain: number;
  /** max over frequency of |H(e^jω)|: the largest output per unit of a detector sinusoid (Ja70). */
  readonly lInfGain: number;
  /** detectorPeakUnits·l1Gain: the largest excursion the detector can cause here (control units). */
  readonly peakUnits: number;
  /** The largest value the section's word holds (datapath outputLimitUnits). */
  readonly limitUnits: number;
  /** 20·log10(limitUnits/peakUnits); negative: the section can overflow. */
  readonly headroomDb: number;
  /** The same for a full-peak detector sinusoid at the worst frequency (L∞). */
  readonly sineHeadroomDb: number;
  /** Right shift of the detector signal into this section (compensated after it) that keeps it from overflowing: ⌈log2(peak/limit)⌉, 0 when it fits. */
  readonly shiftBits: number;
  readonly mayOverflow: boolean;
}

export interface DatapathNoise {
  readonly points: readonly RoundoffPoint[];
  readonly sections: readonly SectionScaling[];
  /** Largest |detector output| in control units: input amplitude × NCO table peak (≤ 1). */
  readonly detectorPeakUnits: number;
  /** Total predicted roundoff at the filter output: variance (units²), mean (units), power = variance + mean². */
  readonly outputNoiseVariance: number;
  /** The part of outputNoiseVariance that is the NCO's phase noise moving the detector's double-frequency term (units²; see rippleMixVariance). */
  readonly rippleMixVariance: number;
  readonly outputNoiseMean: number;
  readonly outputNoisePower: number;
  readonly outputNoiseRms: number;
  /** A full-scale sinusoid at the filter output (peak limitUnits) over the total output noise power, dB. */
  readonly outputSnrDb: number;
  /** Total predicted roundoff in the NCO phase: variance (rad²), mean offset (rad), RMS jitter. */
  readonly phaseNoiseVarianceRad2: number;
  readonly phaseMeanRad: number;
  readonly phaseJitterRad: number;
  readonly phaseJitterDeg: number;
  /** Largest detector peak that no section overflows (≤ 1 unit) over the roundoff noise referred to the detector output (RMS), dB. */
  readonly dynamicRangeDb: number;
  /** Samples of the impulse response run for the L1 norms; true when it was cut and its tail extrapolated. */
  readonly impulseSamples: number;
  readonly impulseExtrapolated: boolean;
  readonly notes: readonly string[];
}

export interface DatapathNoiseInput {
  readonly spec: Pick<LoopSpec, 'sampleRateHz' | 'centerHz' | 'input' | 'nco' | 'fixedPoint'>;
  /** The quantised sections (the values the integer codes stand for). */
  readonly sections: readonly Sos[];
  readonly coefficientFractionBits: number;
  readonly control: NcoControlScaling;
  /** The datapath's largest section output (datapathFigures outputLimitUnits). */
  readonly outputLimitUnits: number;
  /** Frequencies (Hz) for the L∞ search, ending at fs/2 (the analysis grid). */
  readonly freqHz: readonly number[];
}

/** The noise and scaling figures; null (with the reason) when the linearised loop does not settle. */
export function datapathNoise(p: DatapathNoiseInput): { readonly noise: DatapathNoise | null; readonly note: string | null } {
  const { spec, sections, control } = p;
  const d = spec.fixedPoint.dataBits;
  const b = spec.nco.amplitudeBits;
  const tablePeak = sineFullScale(b) / 2 ** (b - 1);
  const kd = loopGain(spec).kd * tablePeak;
  const koT = (2 * Math.PI * control.actualGainHzPerUnit) / spec.sampleRateHz;
  const loop = linearLoop(sections, kd, koT);
  const k = sections.length;
  const yOut = k - 1;
  const thetaOut = k;
  const gains = noiseGains(loop, [yOut, thetaOut]);
  const dc = dcGains(loop);
  if (!gains || !dc) return { noise: null, note: 'the linearised fixed-point loop does not settle (unstable), so its roundoff noise is unbounded' };
  const dataLsb = 2 ** -(d - 1);
  const phaseLsb = (2 * Math.PI) / 2 ** spec.nco.accumulatorBits;
  const ncoMeanSquare = spec.nco.waveform === 'square' ? tablePeak ** 2 : tablePeak ** 2 / 2;
  const at: PointGains = { mode: spec.fixedPoint.rounding, gains, dc, yOut, thetaOut };
  const points: RoundoffPoint[] = [
    roundoffPoint(at, 'input', null, `input quantised to ${d} bits (the converter's)`, null, 0, dataLsb, 'units', ncoMeanSquare),
    roundoffPoint(at, 'detector', null, `detector product rounded to ${d} bits`, b - 1, 0, dataLsb, 'units', 1),
    ...sections.map((_, j) => roundoffPoint(at, 'section', j, `section ${j + 1} output rounded to ${d} bits`, p.coefficientFractionBits, 1 + j, dataLsb, 'units', 1)),
    roundoffPoint(at, 'control', null, `tuning increment rounded to an accumulator LSB`, Math.max(0, control.gainShift), k + 1, phaseLsb, 'rad', 1),
  ];
  const sum = sumOver(points);
  const phaseNoiseVarianceRad2 = sum((x) => x.phaseVarianceRad2);
  const rippleMix = rippleMixVariance(loop, spec, kd, phaseNoiseVarianceRad2);
  const outputNoiseVariance = sum((x) => x.outputVariance) + rippleMix;
  const outputNoiseMean = sum((x) => x.outputMean);
  const outputNoisePower = outputNoiseVariance + outputNoiseMean ** 2;
  const detectorPeakUnits = Math.min(1, spec.input.amplitude * tablePeak);
  const impulse = impulseNorms(loop, 0);
  const lInf = peakResponses(loop, spec.sampleRateHz, p.freqHz);
  const limit = p.outputLimitUnits;
  const scaling = sections.map((_, j) => sectionScaling(j, impulse.l1[j]!, impulse.l2[j]!, lInf[j]!, detectorPeakUnits, limit));
  const safeDetectorPeak = Math.min(1, ...scaling.map((s) => limit / s.l1Gain));
  const detectorReferredRms = Math.sqrt(outputNoiseVariance / gains[0]![0]!);
  const phaseJitterRad = Math.sqrt(phaseNoiseVarianceRad2);
  // Pushed, not spread from arrays made for them: an empty literal and an array of text are arrays of two
  // kinds, and spreading one where the other had been took this function's optimised code out again and
  // again in a long-running process analysing several designs (a recompile each time).
  const notes: string[] = [];
  for (const s of scaling) {
    if (s.mayOverflow) notes.push(`section ${s.section + 1} can reach ${s.peakUnits.toPrecision(3)} units from the detector (L1 gain ${s.l1Gain.toPrecision(3)}) against a word limit of ${s.limitUnits.toPrecision(3)}: shift its input right by ${s.shiftBits} bit${s.shiftBits === 1 ? '' : 's'} (and its output back) or lower the filter's gain`);
  }
  if (impulse.extrapolated) notes.push(`the impulse response was run for ${impulse.samples} samples and its tail extrapolated (one dominant mode)`);
  return {
    note: null,
    noise: {
      points,
      sections: scaling,
      detectorPeakUnits,
      outputNoiseVariance,
      rippleMixVariance: rippleMix,
      outputNoiseMean,
      outputNoisePower,
      outputNoiseRms: Math.sqrt(outputNoisePower),
      outputSnrDb: decibels((limit * limit) / 2 / outputNoisePower),
      phaseNoiseVarianceRad2,
      phaseMeanRad: sum((x) => x.phaseMeanRad),
      phaseJitterRad,
      phaseJitterDeg: (phaseJitterRad * 180) / Math.PI,
      dynamicRangeDb: 2 * decibels(safeDetectorPeak / detectorReferredRms),
      impulseSamples: impulse.samples,
      impulseExtrapolated: impulse.extrapolated,
      notes,
    },
  };
}

/** What every rounding point's figures are read from: the rounding mode, the noise gains and DC gains, and the two outputs. */
interface PointGains {
  readonly mode: LoopSpec['fixedPoint']['rounding'];
  readonly gains: readonly (readonly number[])[];
  readonly dc: readonly (readonly number[])[];
  readonly yOut: number;
  readonly thetaOut: number;
}

/**
 * One rounding point's figures from its error statistics and the gains from its input. A function of the
 * module, not a closure bound to a name per call (so too sumOver's): under tsx, which keeps names, each
 * such closure has its name defined when it is made (Object.defineProperty, about 0.4 µs).
 */
function roundoffPoint(at: PointGains, kind: RoundoffPointKind, section: number | null, label: string, droppedBits: number | null, input: number, lsb: number, lsbUnit: 'units' | 'rad', scale: number): RoundoffPoint {
  const st = roundoffStatistics(at.mode, droppedBits);
  // The input's error reaches the detector multiplied by the NCO output: white, its mean square times the NCO's, zero mean.
  const isInput = kind === 'input';
  const variance = (isInput ? st.powerLsb2 : st.varianceLsb2) * lsb * lsb;
  const mean = isInput ? 0 : st.meanLsb * lsb;
  const og = at.gains[0]![input]! * scale;
  const pg = at.gains[1]![input]! * scale;
  return {
    kind, section, label, droppedBits, lsb, lsbUnit,
    meanLsb: st.meanLsb, varianceLsb2: st.varianceLsb2, powerLsb2: st.powerLsb2,
    outputNoiseGain: og, phaseNoiseGain: pg,
    outputVariance: variance * og, phaseVarianceRad2: variance * pg,
    outputMean: mean * at.dc[at.yOut]![input]!, phaseMeanRad: mean * at.dc[at.thetaOut]![input]!,
  };
}

/** The sum of a figure over the points, in their order. */
function sumOver(points: readonly RoundoffPoint[]): (f: (x: RoundoffPoint) => number) => number {
  return (f) => points.reduce((acc, x) => acc + f(x), 0);
}

/**
 * The multiplier's output also holds the double-frequency term Kd·sin(θi + θo) (G3 Ch. 2), which the
 * linear model leaves out; a phase deviation δθ of the NCO moves it by Kd·cos(θi + θo)·δθ, i.e. puts
 * δθ on a carrier at 2·centerHz (aliased to the loop rate) of mean square Kd²·σθ²/2. When δθ is narrow
 * against that carrier, the filter output sees it through the closed loop's gain at that frequency.
 * Common practice, no source (the product rule of the multiplier detector, REFERENCES.md).
 */
function rippleMixVariance(loop: LinearLoop, spec: DatapathNoiseInput['spec'], kd: number, phaseVarianceRad2: number): number {
  const fs = spec.sampleRateHz;
  const folded = (2 * spec.centerHz) % fs;
  const rippleHz = Math.min(folded, fs - folded);
  const k = loop.sections.length;
  const mags = new Float64Array(k);
  closedLoopMagnitudes(loop, fs, Math.max(rippleHz, 1e-9 * fs), mags, new Float64Array(k), new Float64Array(k));
  return ((kd * kd) / 2) * phaseVarianceRad2 * mags[k - 1]! ** 2;
}

/** 10·log10 clamped to ±3000 dB, so a zero noise (no rounding anywhere) stays finite (results survive JSON). */
function decibels(ratio: number): number {
  if (!(ratio > 0)) return -3000;
  return Math.max(-3000, Math.min(3000, 10 * Math.log10(ratio)));
}

function sectionScaling(section: number, l1Gain: number, l2Gain: number, lInfGain: number, detectorPeak: number, limitUnits: number): SectionScaling {
  const peakUnits = detectorPeak * l1Gain;
  const over = peakUnits / limitUnits;
  return {
    section, l1Gain, l2Gain, lInfGain, peakUnits, limitUnits,
    headroomDb: -2 * decibels(over),
    sineHeadroomDb: -2 * decibels((detectorPeak * lInfGain) / limitUnits),
    shiftBits: over > 1 ? Math.ceil(Math.log2(over)) : 0,
    mayOverflow: over > 1,
  };
}

/**
 * |T_k(e^jω)| of the closed loop from the detector to section k's output,
 * T_k = Π_{j≤k} H_j / (1 + Kd·Ko·T·z⁻¹/(1 − z⁻¹)·Π_j H_j), at frequency f (Hz), for every k.
 */
function closedLoopMagnitudes(loop: LinearLoop, fs: number, f: number, out: Float64Array, partR: Float64Array, partI: Float64Array): void {
  const w = (2 * Math.PI * f) / fs;
  closedLoopMagnitudesAt(loop, Math.cos(w), -Math.sin(w), out, partR, partI);
}

/** closedLoopMagnitudes at the point c1 = cos ω, s1 = −sin ω. */
function closedLoopMagnitudesAt(loop: LinearLoop, c1: number, s1: number, out: Float64Array, partR: Float64Array, partI: Float64Array): void {
  const c2 = 2 * c1 * c1 - 1;
  const s2 = 2 * s1 * c1;
  let pr = 1;
  let pi = 0;
  const k = loop.sections.length;
  for (let j = 0; j < k; j++) {
    const { b, a } = loop.sections[j]!;
    const nr = b[0] + b[1] * c1 + b[2] * c2;
    const ni = b[1] * s1 + b[2] * s2;
    const dr = 1 + a[1] * c1 + a[2] * c2;
    const di = a[1] * s1 + a[2] * s2;
    const dd = dr * dr + di * di || 1e-300;
    const hr = (nr * dr + ni * di) / dd;
    const hi = (ni * dr - nr * di) / dd;
    const tr = pr * hr - pi * hi;
    pi = pr * hi + pi * hr;
    pr = tr;
    partR[j] = pr;
    partI[j] = pi;
  }
  // N = Kd·Ko·T·z⁻¹/(1 − z⁻¹); 1 + N·F
  const gr = loop.kd * loop.koTRadPerUnit;
  const er = 1 - c1;
  const ei = -s1;
  const ee = er * er + ei * ei || 1e-300;
  const nr = (gr * (c1 * er + s1 * ei)) / ee;
  const ni = (gr * (s1 * er - c1 * ei)) / ee;
  const qr = 1 + nr * pr - ni * pi;
  const qi = nr * pi + ni * pr;
  const qq = Math.sqrt(qr * qr + qi * qi) || 1e-300;
  for (let j = 0; j < k; j++) out[j] = Math.sqrt(partR[j]! ** 2 + partI[j]! ** 2) / qq;
}

/**
 * |T_j| at ln f = lf (closedLoopMagnitudes into the scratch mags, partR, partI). A function of its own
 * rather than a closure per section: under tsx, which keeps names, each named closure costs an
 * Object.defineProperty when made.
 */
function sectionMagnitude(loop: LinearLoop, fs: number, lf: number, j: number, mags: Float64Array, partR: Float64Array, partI: Float64Array): number {
  closedLoopMagnitudes(loop, fs, Math.exp(lf), mags, partR, partI);
  return mags[j]!;
}

/** max over frequency of each |T_k|: the largest on the grid, refined by golden-section search in log f between its neighbours (a peak that is one-sided within them is found at its side). */
function peakResponses(loop: LinearLoop, fs: number, freqHz: readonly number[]): number[] {
  const k = loop.sections.length;
  const mags = new Float64Array(k);
  const partR = new Float64Array(k);
  const partI = new Float64Array(k);
  const best = new Float64Array(k);
  const at = new Int32Array(k);
  // Every third point of the analysis grid (≤ 200 of 600): the golden-section step below finds the peak between them.
  // Its cos ω and sin ω are the grid's (the loop responses made them already: unitCircleGrid, the same ω).
  const stride = Math.max(1, Math.floor(freqHz.length / 200));
  const circle = unitCircleGrid(freqHz, fs);
  for (let i = 0; i < freqHz.length; i += stride) {
    closedLoopMagnitudesAt(loop, circle.c1[i]!, -circle.s1[i]!, mags, partR, partI);
    for (let j = 0; j < k; j++) if (mags[j]! > best[j]!) {
      best[j] = mags[j]!;
      at[j] = i;
    }
  }
  const last = freqHz.length - 1;
  return Array.from(best, (value, j) => {
    const i = at[j]!;
    let lo = Math.log(freqHz[Math.max(0, i - stride)]!);
    let hi = Math.log(freqHz[Math.min(last, i + stride)]!);
    const g = (Math.sqrt(5) - 1) / 2;
    let x1 = hi - g * (hi - lo);
    let x2 = lo + g * (hi - lo);
    let f1 = sectionMagnitude(loop, fs, x1, j, mags, partR, partI);
    let f2 = sectionMagnitude(loop, fs, x2, j, mags, partR, partI);
    for (let it = 0; it < 30; it++) {
      if (f1 > f2) {
        hi = x2; x2 = x1; f2 = f1; x1 = hi - g * (hi - lo); f1 = sectionMagnitude(loop, fs, x1, j, mags, partR, partI);
      } else {
        lo = x1; x1 = x2; f1 = f2; x2 = lo + g * (hi - lo); f2 = sectionMagnitude(loop, fs, x2, j, mags, partR, partI);
      }
    }
    return Math.max(value, f1, f2);
  });
}
