import { describe, expect, it } from 'vitest';
import { sineTable, sineFullScale } from '../../src/nco/sineTable.ts';
import { ncoSpectralEstimates } from '../../src/nco/spectralEstimates.ts';
import { python } from '../fixed/python.ts';

/** NCO output over one full accumulator period: table[(k·M mod 2^N) >> (N − P)] (TRG71). */
function ncoSequence(n: number, p: number, b: number, m: number): number[] {
  const table = sineTable(p, b);
  const out: number[] = [];
  for (let k = 0; k < 2 ** n; k++) out.push(table[Math.floor(((k * m) % 2 ** n) / 2 ** (n - p))] as number);
  return out;
}

describe('NCO spectrum against the NS87 phase-truncation spur (numpy FFT as the reference)', () => {
  // Worst spur relative to the carrier, from numpy.fft over one period.
  const worstSpurDbc = (x: number[]) =>
    python<number>(
      `import numpy as np
X = np.abs(np.fft.fft(np.array(data)))
c = int(np.argmax(X[:len(X)//2]))
X[c] = 0; X[-c] = 0
out = float(20*np.log10(X.max()/np.abs(np.fft.fft(np.array(data)))[c]))`,
      x,
    );

  it('is about −6.02·P dBc for a tuning word coprime to the truncated bits', () => {
    // N = 16, P = 8, B = 18 (amplitude error far below the spur): NS87 −6.02·8 = −48.16 dBc.
    const e = ncoSpectralEstimates(16, 8, 18);
    expect(worstSpurDbc(ncoSequence(16, 8, 18, 12345))).toBeCloseTo(e.phaseTruncationSpurDbc!, 0);
  });

  it('reaches the worst case −6.02·P + 3.92 dBc when gcd(M, 2^(N−P)) = 2^(N−P−1)', () => {
    // M = 7·2^7: gcd with 2^8 is 2^7 — NS87's worst case, −48.16 + 3.92 = −44.24 dBc.
    const e = ncoSpectralEstimates(16, 8, 18);
    expect(worstSpurDbc(ncoSequence(16, 8, 18, 7 * 2 ** 7))).toBeCloseTo(e.phaseTruncationSpurWorstDbc!, 1);
  });
});

describe('sine table amplitude quantisation against Be48', () => {
  it('has SNR 6.02·B + 1.76 dB, less the 2^(B−1)/(2^(B−1) − 1) full-scale ratio', () => {
    // Be48: uniform rounding error of one LSB step gives noise LSB²/12 against a sine of power FS²/2.
    // Our full scale is 2^(B−1) − 1, so the signal is 20·log10((2^(B−1) − 1)/2^(B−1)) dB below Be48's.
    const p = 14;
    for (const b of [8, 12, 16]) {
      const t = sineTable(p, b);
      const fs = sineFullScale(b);
      let noise = 0;
      for (let k = 0; k < t.length; k++) noise += ((t[k] as number) - fs * Math.sin((2 * Math.PI * k) / t.length)) ** 2;
      const snrDb = 10 * Math.log10((fs * fs) / 2 / (noise / t.length));
      const expected = ncoSpectralEstimates(32, p, b).amplitudeSnrDb + 20 * Math.log10(fs / 2 ** (b - 1));
      expect(Math.abs(snrDb - expected)).toBeLessThan(0.3);
    }
  });
});
