import { describe, expect, it } from 'vitest';
import { simulate, simulateAsync } from '../../src/planDesign.ts';
import { mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { designLoopFilter } from '../../src/design.ts';
import { parseScenario, type Scenario } from '../../src/spec/scenario.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

const deg = (rad: number) => (rad * 180) / Math.PI;

describe('simulate: steady-state phase error (G3 Ch. 2)', () => {
  it('drives the phase error of a type-2 (PI) loop to 0 after a frequency step', () => {
    // Type 2: zero steady-state phase error after a frequency step (G3; REFERENCES.md).
    const r = simulate(mainsSyncSpec, { kind: 'frequency-step', stepHz: 1, atS: 0.2, durationS: 3 });
    for (const run of [r.float!, r.bitTrue!]) {
      expect(run.metrics.locked).toBe(true);
      expect(Math.abs(run.metrics.steadyStatePhaseErrorDeg)).toBeLessThan(0.5);
      expect(Math.abs(run.metrics.finalFrequencyErrorHz)).toBeLessThan(0.01);
    }
  });

  it('leaves asin(Δω/(K·F(0))) on a type-1 (single-pole) loop after a frequency step', () => {
    // Type 1 with a sinusoidal detector: sin θe = Δω/(K·F(0)) (G3 Ch. 2). K = Kd·Ko, Kd = A/2,
    // Ko = 2π·gainHzPerUnit, F(0) = 1 for the unit-DC-gain single pole; Δω = 2π·stepHz.
    const spec = ultrasonicSinglePoleSpec;
    const stepHz = 300;
    const expectedDeg = deg(Math.asin(stepHz / ((spec.input.amplitude / 2) * spec.nco.gainHzPerUnit)));
    const r = simulate(spec, { kind: 'frequency-step', stepHz, atS: 0.002, durationS: 0.02 });
    expect(r.float!.metrics.steadyStatePhaseErrorDeg).toBeCloseTo(expectedDeg, 1);
    // Bit-true: within the NCO's phase resolution 360°/2^P of the float loop (table address truncation).
    expect(Math.abs(r.bitTrue!.metrics.steadyStatePhaseErrorDeg - expectedDeg)).toBeLessThan(360 / 2 ** spec.nco.phaseBits + 0.1);
  });

  it('returns the phase error to 0 after a phase step on the PI loop', () => {
    const r = simulate(mainsSyncSpec, { kind: 'phase-step', stepDeg: 40, atS: 0.3, durationS: 2 });
    expect(Math.abs(r.float!.metrics.steadyStatePhaseErrorDeg)).toBeLessThan(0.5);
    expect(r.float!.metrics.cycleSlips).toBe(0);
    // Right after the step the error is about +40° (θe = θi − θo jumps with θi).
    const trace = r.float!.traces.phaseErrorRad;
    expect(deg(Math.max(...trace.max))).toBeGreaterThan(35);
  });
});

describe('simulate: loop conventions', () => {
  it('locks a multiplier loop with its NCO output 90° ahead of the input (common practice, no source)', () => {
    // x = A sin θi, NCO = cos θo, locked at θi = θo: the NCO output leads the input by a quarter cycle.
    const spec = ultrasonicSinglePoleSpec;
    const r = simulate(spec, { kind: 'tone', offsetHz: 0, durationS: 0.01 }, { mode: 'bit-true', keepRecord: true });
    const rec = r.bitTrue!.record!;
    // Phase of each sequence at centerHz by a single DFT bin over the second half.
    const bin = (v: Int32Array) => {
      let re = 0;
      let im = 0;
      for (let n = rec.length / 2; n < rec.length; n++) {
        const w = (2 * Math.PI * spec.centerHz * n) / spec.sampleRateHz;
        re += (v[n] as number) * Math.cos(w);
        im -= (v[n] as number) * Math.sin(w);
      }
      return Math.atan2(im, re);
    };
    let lead = deg(bin(rec.ncoCode) - bin(rec.inputCode));
    lead -= 360 * Math.round(lead / 360);
    expect(lead).toBeCloseTo(90, 0);
  });

  it('demodulates FM: filter output × gainHzPerUnit tracks a sine message inside the loop bandwidth', () => {
    // The loop's natural frequency is ~1.1 kHz; a 100 Hz message with 500 Hz deviation is well inside.
    const spec = ultrasonicSinglePoleSpec;
    const sc: Scenario = { kind: 'fm', modulation: 'sine', rateHz: 100, deviationHz: 500, durationS: 0.05 };
    const r = simulate(spec, sc, { fullTraces: true });
    for (const run of [r.float!, r.bitTrue!]) {
      expect(run.metrics.demodErrorRelative!).toBeLessThan(0.1);
      expect(run.metrics.cycleSlips).toBe(0);
    }
    // The demodulated peak is the deviation (within 10 %).
    const full = r.float!.full!;
    let peak = 0;
    for (let n = full.filterOutput.length / 2; n < full.filterOutput.length; n++) peak = Math.max(peak, (full.filterOutput[n] as number) * spec.nco.gainHzPerUnit);
    expect(peak).toBeGreaterThan(450);
    expect(peak).toBeLessThan(600);
  });

  it('keeps the bit-true loop within quantisation error of the float loop', () => {
    // Bound: NCO phase is truncated to P address bits, a phase error of up to 2π/2^P (NS87's model),
    // plus input/detector rounding at D bits (2^−(D−1) full scale, Be48) seen through Kd.
    const spec = ultrasonicSinglePoleSpec;
    const r = simulate(spec, { kind: 'tone', offsetHz: 150, durationS: 0.02 }, { fullTraces: true });
    const boundDeg = 360 / 2 ** spec.nco.phaseBits + deg(2 ** -(spec.fixedPoint.dataBits - 1) / (spec.input.amplitude / 2));
    expect(Math.abs(r.bitTrue!.metrics.steadyStatePhaseErrorDeg - r.float!.metrics.steadyStatePhaseErrorDeg)).toBeLessThan(boundDeg);
    const f = r.float!.full!.filterOutput;
    const b = r.bitTrue!.full!.filterOutput;
    let sum2 = 0;
    for (let n = f.length / 2; n < f.length; n++) sum2 += ((f[n] as number) - (b[n] as number)) ** 2;
    const rms = Math.sqrt(sum2 / (f.length / 2));
    // The filter output is Δf/gain; a phase offset of boundDeg changes the ripple by ~ Kd·bound.
    expect(rms).toBeLessThan((spec.input.amplitude / 2) * (boundDeg * Math.PI) / 180);
  });
});

describe('simulate: noise, traces, progress', () => {
  const noisy = (seed: number): Scenario => ({ kind: 'tone', offsetHz: 50, durationS: 0.005, snrDb: 20, seed });

  it('gives the same output for the same seed and different noise for a different seed', () => {
    const a = simulate(ultrasonicSinglePoleSpec, noisy(7), { mode: 'bit-true' });
    const b = simulate(ultrasonicSinglePoleSpec, noisy(7), { mode: 'bit-true' });
    const c = simulate(ultrasonicSinglePoleSpec, noisy(8), { mode: 'bit-true' });
    expect(a.bitTrue!.checksum).toBe(b.bitTrue!.checksum);
    expect(c.bitTrue!.checksum).not.toBe(a.bitTrue!.checksum);
  });

  it('adds noise of the requested SNR (sample variance of the input error)', () => {
    // SNR = (A²/2)/σ²: 20 dB with A = 0.8 → σ² = 0.0032.
    const r = simulate(ultrasonicSinglePoleSpec, { ...noisy(3), durationS: 0.05 }, { mode: 'bit-true', keepRecord: true });
    const clean = simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 50, durationS: 0.05 }, { mode: 'bit-true', keepRecord: true });
    const x = r.bitTrue!.record!.inputCode;
    const y = clean.bitTrue!.record!.inputCode;
    let s2 = 0;
    for (let n = 0; n < x.length; n++) s2 += (((x[n] as number) - (y[n] as number)) / 2 ** 15) ** 2;
    expect(s2 / x.length).toBeGreaterThan(0.0032 * 0.9);
    expect(s2 / x.length).toBeLessThan(0.0032 * 1.1);
  });

  it('decimated traces keep every bucket’s min and max of the full trace', () => {
    const r = simulate(ultrasonicSinglePoleSpec, { kind: 'fm', modulation: 'triangle', rateHz: 200, deviationHz: 300, durationS: 0.01 }, { mode: 'float', fullTraces: true, buckets: 37 });
    const full = r.float!.full!.filterOutput;
    const tr = r.float!.traces.filterOutput;
    expect(tr.min.length).toBe(37);
    const total = full.length;
    for (let k = 0; k < 37; k++) {
      const from = Math.floor((k * total) / 37);
      const to = Math.floor(((k + 1) * total) / 37);
      const slice = Array.from(full.subarray(from, to));
      expect(tr.min[k]).toBe(Math.min(...slice));
      expect(tr.max[k]).toBe(Math.max(...slice));
      expect(tr.bucketStartS[k]).toBeCloseTo(from / ultrasonicSinglePoleSpec.sampleRateHz, 15);
    }
  });

  it('reports increasing progress ending at 1 and stops when aborted', async () => {
    const seen: number[] = [];
    simulate(mainsSyncSpec, { kind: 'tone', offsetHz: 0, durationS: 5 }, { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(3);
    expect(seen.every((f, i) => i === 0 || f > (seen[i - 1] as number))).toBe(true);
    expect(seen.at(-1)).toBe(1);
    const flag = { aborted: false };
    const run = simulateAsync(mainsSyncSpec, { kind: 'tone', offsetHz: 0, durationS: 50 }, { signal: flag, onProgress: (f) => { if (f > 0.1) flag.aborted = true; } });
    await expect(run).rejects.toThrow(/aborted/);
  });

  it('runs wide phase accumulators (48 and 64 bits) to the same lock as 32 bits', () => {
    const base = simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 100, durationS: 0.01 }, { mode: 'bit-true' });
    for (const bits of [48, 64]) {
      const spec: LoopSpec = { ...ultrasonicSinglePoleSpec, nco: { ...ultrasonicSinglePoleSpec.nco, accumulatorBits: bits } };
      const r = simulate(spec, { kind: 'tone', offsetHz: 100, durationS: 0.01 }, { mode: 'bit-true' });
      expect(r.bitTrue!.metrics.locked).toBe(true);
      expect(r.bitTrue!.metrics.steadyStatePhaseErrorDeg).toBeCloseTo(base.bitTrue!.metrics.steadyStatePhaseErrorDeg, 0);
      expect(r.bitTrue!.metrics.finalFrequencyErrorHz).toBeCloseTo(base.bitTrue!.metrics.finalFrequencyErrorHz, 2);
    }
  });

  it('uses the spec’s loop filter sections unchanged in the float loop', () => {
    expect(designLoopFilter(mainsSyncSpec).sections.length).toBeGreaterThan(0);
  });
});

describe('parseScenario', () => {
  it('accepts each kind and names the offending field otherwise', () => {
    expect(parseScenario({ kind: 'fm', modulation: 'square', rateHz: 10, deviationHz: 5, durationS: 1, seed: 3 }).ok).toBe(true);
    const bad = parseScenario({ kind: 'frequency-step', stepHz: 10, atS: -1, durationS: 1 });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues[0]?.field).toBe('atS');
    const unknown = parseScenario({ kind: 'tone', offsetHz: 1, durationS: 1, sneed: 2 });
    expect(!unknown.ok && unknown.issues[0]?.field).toBe('sneed');
    const dur = parseScenario({ kind: 'tone', offsetHz: 1, durationS: 0 });
    expect(!dur.ok && dur.issues[0]?.field).toBe('durationS');
  });

  it('rejects a run longer than the sample limit, naming durationS', () => {
    expect(() => simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 0, durationS: 1000 })).toThrow(/durationS/);
  });
});

describe('simulate: lock indicator', () => {
  it('reads near 1 when locked and near 0 when the offset is beyond hold-in (K·F(0) = 800 Hz, G3)', () => {
    const locked = simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 0, durationS: 0.01 }, { mode: 'float' });
    const tr = locked.float!.traces.lockIndicator;
    expect(tr.min.at(-1)!).toBeGreaterThan(0.9);
    const unlocked = simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 3000, durationS: 0.01 }, { mode: 'float' });
    const u = unlocked.float!.traces.lockIndicator;
    const mid = Array.from(u.max.slice(500)).reduce((a, b) => a + b, 0) / 500;
    expect(Math.abs(mid)).toBeLessThan(0.5);
    expect(unlocked.float!.metrics.locked).toBe(false);
    expect(unlocked.float!.metrics.cycleSlips).toBeGreaterThan(10);
  });
});

describe('simulate: lock time', () => {
  it('matches the decay envelope of a second-order type-2 loop after a phase step (G3 Ch. 2, Og5)', () => {
    // Phase-error response to a step Δθ: Δθ·e^(−ζωn t)·(cos ωd t − ζ/√(1−ζ²)·sin ωd t); its envelope
    // Δθ·e^(−ζωn t)/√(1−ζ²) falls below the tolerance at t = ln(Δθ/(tol·√(1−ζ²)))/(ζωn).
    const spec: LoopSpec = { ...mainsSyncSpec, rippleFilter: null };
    const zeta = 0.707;
    const wn = 2 * Math.PI * 5;
    const stepRad = (40 * Math.PI) / 180;
    const tol = 0.1;
    const expectedS = Math.log(stepRad / (tol * Math.sqrt(1 - zeta * zeta))) / (zeta * wn);
    const r = simulate(spec, { kind: 'phase-step', stepDeg: 40, atS: 0.5, durationS: 2 }, { mode: 'float', lockToleranceRad: tol });
    // Slack: one lock bucket (a quarter of the 10 ms ripple period; the boxcar's delay is taken off)
    // and the oscillation crossing the band before its envelope does.
    expect(Math.abs(r.float!.metrics.lockTimeS! - 0.5 - expectedS)).toBeLessThan(0.012);
  });
});
