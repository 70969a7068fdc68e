/**
 * Generated audit specs: every filter kind (single-pole, lag-lead and PI from time constants and from
 * targets, Butterworth 1–4), with and without a ripple filter and a prewarp frequency, over several loop
 * rates. Loops are placed by natural frequency and damping (G3 Ch. 2 formulas) so they have margins;
 * the numbers are a seeded draw, not results of our code.
 */
import type { LoopSpec } from '../../src/index.ts';
import { exampleSpecs } from '../../src/index.ts';
import { mulberry32 } from '../reference/random.ts';

const RATES = [8e3, 10e3, 48e3, 1e6, 100e6];

function base(name: string, fs: number, amplitude: number, gainHz: number, centerHz: number): Omit<LoopSpec, 'filter'> {
  return {
    specVersion: 1,
    name,
    clockHz: fs * 4,
    sampleRateHz: fs,
    centerHz,
    input: { amplitude },
    detector: { kind: 'multiplier' },
    nco: { accumulatorBits: 32, phaseBits: 12, amplitudeBits: 14, gainHzPerUnit: gainHz, waveform: 'sine' },
    rippleFilter: null,
    discretization: { method: 'bilinear', prewarpHz: null },
    fixedPoint: { coefficientBits: 24, coefficientFractionBits: 'auto', dataBits: 18, accumulatorBits: 48, rounding: 'nearest', overflow: 'saturate' },
  };
}

export interface AuditCase {
  readonly label: string;
  readonly spec: LoopSpec;
}

/** The generated set: 4 kinds × variants × ripple/prewarp, deterministic. */
export function generatedCases(seed = 20261202): AuditCase[] {
  const rnd = mulberry32(seed);
  const out: AuditCase[] = [];
  const kinds = ['single-pole', 'lag-lead-tau', 'lag-lead-targets', 'pi-tau', 'pi-targets', 'butterworth-1', 'butterworth-2', 'butterworth-3', 'butterworth-4'];
  let n = 0;
  for (const kind of kinds) {
    for (const ripple of [false, true]) {
      for (const prewarp of [false, true]) {
        const fs = RATES[Math.floor(rnd() * RATES.length)]!;
        const fn = fs * 10 ** (-4 + 2 * rnd()); // natural frequency 1e-4..1e-2 of fs
        const zeta = 0.5 + rnd();
        const wn = 2 * Math.PI * fn;
        const amp = 0.25 + 0.75 * rnd();
        // centre anywhere below Nyquist, so that some 2·fc ripples alias (2fc > fs/2)
        const centerHz = fs * (0.02 + 0.46 * rnd());
        let k: number;
        let filter: LoopSpec['filter'];
        if (kind === 'single-pole') {
          // K = ωn/(2ζ), τ = 1/(2ζωn) ⇒ cutoff = 2ζ·fn (G3: ωn = √(K/τ), ζ = 1/(2√(Kτ)))
          k = wn / (2 * zeta);
          filter = { kind: 'single-pole', cutoffHz: 2 * zeta * fn };
        } else if (kind.startsWith('lag-lead') || kind.startsWith('pi')) {
          k = wn * (3 + 20 * rnd());
          const isPi = kind.startsWith('pi');
          if (kind.endsWith('targets')) filter = { kind: isPi ? 'pi' : 'lag-lead', naturalHz: fn, damping: zeta };
          else if (isPi) filter = { kind: 'pi', tau1S: k / wn ** 2, tau2S: (2 * zeta) / wn };
          else {
            const t2 = (2 * zeta) / wn - 1 / k;
            filter = { kind: 'lag-lead', tau1S: k / wn ** 2 - t2, tau2S: t2 };
          }
        } else {
          const order = Number(kind.slice(-1));
          const fc = fn * 4;
          k = 2 * Math.PI * fc * (0.1 + 0.3 * rnd());
          filter = { kind: 'butterworth', order, cutoffHz: fc };
        }
        const gainHz = k / (Math.PI * amp); // K = (A/2)·2π·g
        const spec: LoopSpec = { ...base(`audit_${n++}`, fs, amp, gainHz, centerHz), filter } as LoopSpec;
        if (ripple) spec.rippleFilter = { order: 1 + Math.floor(rnd() * 4), cutoffHz: Math.min(fn * (8 + 20 * rnd()), fs * 0.4) };
        if (prewarp) spec.discretization = { method: 'bilinear', prewarpHz: Math.min(fn * (1 + 3 * rnd()), fs * 0.4) };
        out.push({ label: `${kind}${ripple ? '+ripple' : ''}${prewarp ? '+prewarp' : ''} fs=${fs}`, spec });
      }
    }
  }
  return out;
}

/** The demo examples as shipped (src/spec/examples.ts). */
export function exampleCases(): AuditCase[] {
  return exampleSpecs.map((e) => ({ label: `example ${e.id}`, spec: e.spec }));
}

/**
 * The generated loops with the NCO gain raised 10^2.5…10^5.5 times: crossovers near and past Nyquist,
 * unstable discrete and analog loops, negative margins — the corners where margin searches go wrong.
 */
export function boostedCases(): AuditCase[] {
  return [1, 2, 3].flatMap((seed) => generatedCases(seed)).map((c, i) => {
    const boost = 10 ** (2.5 + 3 * ((i * 0.618) % 1));
    const gainHzPerUnit = Math.min(c.spec.nco.gainHzPerUnit * boost, 1e12);
    return { label: `${c.label} gain×${boost.toFixed(0)}`, spec: { ...c.spec, nco: { ...c.spec.nco, gainHzPerUnit } } };
  });
}
