/**
 * NCO figures against exact integer arithmetic (BigInt here, Python's Fraction in
 * reference/audit_reference.py) and the published estimates (TRG71, NS87, Be48).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, exampleSpecs, ncoSpectralEstimates, ncoTuning, sineTable } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';
import { mulberry32 } from '../reference/random.ts';

interface RefNco { tuningWordDecimal: string; hi: string; lo: string; actualHz: number; errorHz: number; errorPpm: number; resolutionHz: number }

describe('tuning word M = round(f·2^N/fs) (TRG71)', () => {
  it('10.7 MHz at 100 MHz, 48-bit: 0.107·2^48 = 30117822508040.192 → 30117822508040 (worked by hand)', () => {
    const t = ncoTuning(10.7e6, 100e6, 48);
    // 2^48 = 281474976710656; ·107/1000 = 30117822508040.192 (exact: 10.7e6 and 1e8 are exact doubles)
    expect(t.tuningWordDecimal).toBe('30117822508040');
    expect(t.tuningWordDecimal).toBe('30117822508040');
    expect(t.tuningWordHi * 2 ** 32 + t.tuningWordLo).toBe(30117822508040);
    // actual = M·fs/2^48; error = −0.192·fs/2^48 Hz
    expect(t.errorHz).toBeCloseTo((-0.192 * 100e6) / 2 ** 48, 20);
    expect(t.resolutionHz).toBe(100e6 / 2 ** 48);
  });

  it('10.7 MHz at 100 MHz, 64-bit: 2^64·107/1000 = 1973801615886922022.912 → …023 (worked by hand, BigInt)', () => {
    const t = ncoTuning(10.7e6, 100e6, 64);
    const exact = (2n ** 64n * 107n + 500n) / 1000n; // half away from zero for a positive value
    expect(exact.toString()).toBe('1973801615886922023');
    expect(t.tuningWordDecimal).toBe(exact.toString());
    expect(BigInt(t.tuningWordHi) * 2n ** 32n + BigInt(t.tuningWordLo)).toBe(exact);
    // error = +0.088·fs/2^64 Hz → ppm = error/f·1e6
    const errHz = (0.088 * 100e6) / 2 ** 64;
    expect(t.errorHz / errHz).toBeCloseTo(1, 9);
    expect(t.errorPpm / ((errHz / 10.7e6) * 1e6)).toBeCloseTo(1, 9);
  });

  it('a tie rounds half away from zero: f = fs·(2k+1)/2^(N+1) (worked by hand)', () => {
    // f·2^N/fs = 2.5 exactly with N = 4, fs = 16, f = 2.5 → M = 3
    expect(ncoTuning(2.5, 16, 4).tuningWordDecimal).toBe('3');
    // f·2^N/fs = 3.5 → 4 (half-even would also give 4; 2.5 distinguishes the modes)
    expect(ncoTuning(3.5, 16, 4).tuningWordDecimal).toBe('4');
  });

  it('200 random (f, fs, N ∈ {24, 32, 40, 48, 53, 56, 64}) agree with Python Fraction to the LSB', () => {
    const rnd = mulberry32(7);
    const cases = Array.from({ length: 200 }, () => {
      const fs = [8e3, 10e3, 44.1e3, 1e6, 61.44e6, 100e6, 122.88e6][Math.floor(rnd() * 7)]!;
      const n = [24, 32, 40, 48, 53, 56, 64][Math.floor(rnd() * 7)]!;
      return { frequencyHz: fs * 0.499 * rnd() + 1e-3, sampleRateHz: fs, accumulatorBits: n };
    });
    const refs = runAuditReference<{ nco: RefNco[] }>({ nco: cases }).nco;
    cases.forEach((c, i) => {
      const t = ncoTuning(c.frequencyHz, c.sampleRateHz, c.accumulatorBits);
      const e = refs[i]!;
      expect(t.tuningWordDecimal).toBe(e.tuningWordDecimal);
      expect(String(t.tuningWordHi)).toBe(e.hi);
      expect(String(t.tuningWordLo)).toBe(e.lo);
      expect(t.actualHz).toBeCloseTo(e.actualHz, 6);
      expect(Math.abs(t.errorHz - e.errorHz)).toBeLessThanOrEqual(Math.abs(e.errorHz) * 1e-12 + 1e-300);
      expect(Math.abs(t.errorPpm - e.errorPpm)).toBeLessThanOrEqual(Math.abs(e.errorPpm) * 1e-12 + 1e-300);
      expect(t.resolutionHz).toBe(e.resolutionHz);
      // |error| ≤ resolution/2 (TRG71: the nearest word)
      expect(Math.abs(t.errorHz)).toBeLessThanOrEqual(t.resolutionHz / 2 * (1 + 1e-12));
    });
  });

  it('analyzeDesign reports the tuning word of centerHz at the loop rate sampleRateHz (DESIGN.md)', () => {
    for (const e of exampleSpecs) {
      const r = analyzeDesign(e.spec);
      const n = BigInt(e.spec.nco.accumulatorBits);
      // exact: centerHz and sampleRateHz of the examples are integers
      const num = BigInt(e.spec.centerHz) * 2n ** n;
      const den = BigInt(e.spec.sampleRateHz);
      const m = (2n * num + den) / (2n * den); // round half up = half away from zero for positives
      expect(r.nco.tuning.tuningWordDecimal).toBe(m.toString());
    }
  });
});

describe('spectral estimates (NS87, Be48)', () => {
  it('spur −6.02·P dBc, worst −6.02·P + 3.92 dBc, SNR 6.02·B + 1.76 dB; no spur when P = N', () => {
    for (const [n, p, b] of [[32, 12, 14], [48, 16, 18], [24, 10, 12]] as const) {
      const s = ncoSpectralEstimates(n, p, b);
      expect(s.phaseTruncationSpurDbc).toBeCloseTo(-6.02 * p, 12);
      expect(s.phaseTruncationSpurWorstDbc).toBeCloseTo(-6.02 * p + 3.92, 12);
      expect(s.amplitudeSnrDb).toBeCloseTo(6.02 * b + 1.76, 12);
    }
    expect(ncoSpectralEstimates(12, 12, 12).phaseTruncationSpurDbc).toBeNull();
  });

  it('the reported table SNR is within 1.25 dB of the SNR measured on the shipped table (Be48; full scale defined)', () => {
    // The table's full scale is 2^(B−1) − 1 (README), while 6.02·B + 1.76 assumes a peak of 2^(B−1):
    // for narrow words the estimate overstates the SNR by 20·log10(2^(B−1)/(2^(B−1) − 1)) (6 dB at B = 2).
    for (const b of [2, 3, 4, 6, 8, 12, 16]) {
      const t = sineTable(12, b);
      const fs = 2 ** (b - 1) - 1;
      let err = 0;
      let sig = 0;
      for (let k = 0; k < t.length; k++) {
        const ideal = fs * Math.sin((2 * Math.PI * k) / t.length);
        err += (t[k]! - ideal) ** 2;
        sig += ideal ** 2;
      }
      const measured = 10 * Math.log10(sig / err);
      expect(Math.abs(ncoSpectralEstimates(32, 12, b).amplitudeSnrTableDb - measured), `B = ${b}`).toBeLessThan(1.25);
    }
  });

  it('sine table: full scale 2^(B−1) − 1, round half away from zero, exact symmetries (README; common practice)', () => {
    const t = sineTable(10, 14);
    expect(Math.max(...t)).toBe(8191);
    expect(Math.min(...t)).toBe(-8191);
    for (let k = 0; k < t.length; k++) {
      const x = 8191 * Math.sin((2 * Math.PI * k) / 1024);
      const q = Math.sign(x) * Math.floor(Math.abs(x) + 0.5);
      expect(Math.abs(t[k]! - q)).toBeLessThanOrEqual(k % 256 === 0 ? 0 : 1e-9);
    }
  });
});
