/**
 * Example specs of the invented demo scenario (DESIGN.md, Harrow Cove Instruments), one per filter kind.
 * The widths are ordinary choices for an FPGA/DSP loop, not the result of a search.
 */
import type { LoopSpec } from './schema.ts';

export interface ExampleSpec {
  readonly id: string;
  readonly title: string;
  readonly description: string;
  readonly spec: LoopSpec;
}

/** 50 Hz mains synchronisation for a grid-tie inverter: type-2 PI loop designed from targets. */
export const mainsSyncSpec: LoopSpec = {
  specVersion: 1,
  name: 'mains_sync_50hz',
  clockHz: 100e6,
  sampleRateHz: 10e3,
  centerHz: 50,
  input: { amplitude: 1 },
  detector: { kind: 'multiplier' },
  nco: { accumulatorBits: 32, phaseBits: 12, amplitudeBits: 16, gainHzPerUnit: 20, waveform: 'sine' },
  filter: { kind: 'pi', naturalHz: 5, damping: 0.707 },
  rippleFilter: { order: 2, cutoffHz: 40 },
  discretization: { method: 'bilinear', prewarpHz: null },
  fixedPoint: {
    coefficientBits: 18,
    coefficientFractionBits: 'auto',
    dataBits: 16,
    accumulatorBits: 40,
    rounding: 'nearest',
    overflow: 'saturate',
  },
};

/** 40 kHz ultrasonic flow-meter carrier tracker at a 1 MHz loop rate: single-pole type-1 loop (ζ ≈ 0.7). */
export const ultrasonicSinglePoleSpec: LoopSpec = {
  specVersion: 1,
  name: 'flow_carrier_40k',
  clockHz: 50e6,
  sampleRateHz: 1e6,
  centerHz: 40e3,
  input: { amplitude: 0.8 },
  detector: { kind: 'multiplier' },
  nco: { accumulatorBits: 32, phaseBits: 10, amplitudeBits: 14, gainHzPerUnit: 2000, waveform: 'sine' },
  filter: { kind: 'single-pole', cutoffHz: 1600 },
  rippleFilter: null,
  discretization: { method: 'bilinear', prewarpHz: null },
  fixedPoint: {
    coefficientBits: 18,
    coefficientFractionBits: 'auto',
    dataBits: 16,
    accumulatorBits: 40,
    rounding: 'nearest',
    overflow: 'saturate',
  },
};

/**
 * The same carrier tracker with a passive lag-lead filter from explicit time constants
 * (ωn ≈ 2π·500 Hz, ζ ≈ 0.7 at K ≈ 5027 1/s) and a ripple filter, because the lag-lead passes
 * τ2/(τ1+τ2) ≈ 0.5 of the 80 kHz ripple on its own.
 */
export const ultrasonicLagLeadSpec: LoopSpec = {
  ...ultrasonicSinglePoleSpec,
  name: 'flow_carrier_40k_laglead',
  filter: { kind: 'lag-lead', tau1S: 2.6e-4, tau2S: 2.5e-4 },
  rippleFilter: { order: 2, cutoffHz: 8000 },
};

/** 10.7 MHz IF FM demodulator at a 100 MHz clock: 2nd-order Butterworth loop filter, prewarped at its cutoff. */
export const ifFmDemodSpec: LoopSpec = {
  specVersion: 1,
  name: 'if_fm_demod_10m7',
  clockHz: 100e6,
  sampleRateHz: 100e6,
  centerHz: 10.7e6,
  input: { amplitude: 0.5 },
  detector: { kind: 'multiplier' },
  nco: { accumulatorBits: 32, phaseBits: 12, amplitudeBits: 12, gainHzPerUnit: 800e3, waveform: 'sine' },
  filter: { kind: 'butterworth', order: 2, cutoffHz: 800e3 },
  rippleFilter: null,
  discretization: { method: 'bilinear', prewarpHz: 800e3 },
  fixedPoint: {
    coefficientBits: 18,
    coefficientFractionBits: 'auto',
    dataBits: 18,
    accumulatorBits: 48,
    rounding: 'nearest',
    overflow: 'saturate',
  },
};

export const exampleSpecs: readonly ExampleSpec[] = [
  {
    id: 'mains-sync',
    title: 'Mains sync, 50 Hz at 10 kHz',
    description: 'Grid-tie inverter synchronisation: PI loop (type 2) from natural frequency and damping, 2nd-order ripple filter against the 100 Hz detector ripple.',
    spec: mainsSyncSpec,
  },
  {
    id: 'ultrasonic-single-pole',
    title: 'Ultrasonic carrier, 40 kHz at 1 MHz',
    description: 'Flow-meter carrier tracker with a single-pole loop filter (type 1).',
    spec: ultrasonicSinglePoleSpec,
  },
  {
    id: 'ultrasonic-lag-lead',
    title: 'Ultrasonic carrier, lag-lead',
    description: 'The same tracker with a passive lag-lead filter from time constants and a ripple filter.',
    spec: ultrasonicLagLeadSpec,
  },
  {
    id: 'if-fm-demod',
    title: 'IF FM demodulator, 10.7 MHz at 100 MHz',
    description: 'FM demodulator loop with a 2nd-order Butterworth loop filter prewarped at its cutoff.',
    spec: ifFmDemodSpec,
  },
];
