/**
 * The NCO output spectrum the editor plots (src/nco/spectrum.ts) against numpy and SciPy: the same
 * accumulator, table and window computed in Python (numpy.fft.rfft, scipy.signal.windows.blackmanharris
 * with sym=False), and the measured largest spur against NS87's estimate.
 */
import { describe, expect, it } from 'vitest';
import { mainsSyncSpec, ultrasonicSinglePoleSpec, ifFmDemodSpec } from '../../src/spec/examples.ts';
import { blackmanHarris, ncoSpectrum, SPECTRUM_FLOOR_DBC } from '../../src/nco/spectrum.ts';
import { fftInPlace } from '../../src/nco/fft.ts';
import { ncoTuning } from '../../src/nco/tuningWord.ts';
import { python } from '../fixed/python.ts';

const POINTS = 4096;

/** numpy/SciPy's dBc spectrum of the NCO: table round-half-away of (2^(B−1) − 1)·sin, phase >> (N − P). */
function numpySpectrum(spec: typeof mainsSyncSpec): number[] {
  const m = ncoTuning(spec.centerHz, spec.sampleRateHz, spec.nco.accumulatorBits).tuningWordDecimal;
  return python<number[]>(
    `import numpy as np
from scipy.signal.windows import blackmanharris
n, p, b, m, pts = data['n'], data['p'], data['b'], int(data['m']), data['points']
fs = 2**(b-1) - 1
k = np.arange(2**p)
x = fs*np.sin(2*np.pi*k/2**p)
table = (np.sign(x)*np.floor(np.abs(x) + 0.5)).astype(np.int64)
addr = [((i*m) % 2**n) >> (n - p) for i in range(pts)]
codes = table[addr].astype(float)
X = np.abs(np.fft.rfft(codes*blackmanharris(pts, sym=False)))**2
ref = X[1:].max()
out = [max(10*np.log10(v/ref), -200.0) if v > 0 else -200.0 for v in X]`,
    { n: spec.nco.accumulatorBits, p: spec.nco.phaseBits, b: spec.nco.amplitudeBits, m, points: POINTS },
  );
}

describe('NCO output spectrum', () => {
  it.each([
    ['mains', mainsSyncSpec],
    ['ultrasonic', ultrasonicSinglePoleSpec],
    ['IF FM', ifFmDemodSpec],
  ] as const)('%s: matches numpy and SciPy bin by bin (above −150 dBc, to 1e-6 dB)', (_name, spec) => {
    const ours = ncoSpectrum(spec, POINTS);
    const theirs = numpySpectrum(spec);
    expect(ours.levelDbc).toHaveLength(theirs.length);
    let compared = 0;
    for (let k = 0; k < theirs.length; k++) {
      if (theirs[k]! < -150) continue;
      expect(ours.levelDbc[k]).toBeCloseTo(theirs[k]!, 6);
      compared++;
    }
    expect(compared).toBeGreaterThan(20);
    expect(ours.freqHz[1]).toBeCloseTo(spec.sampleRateHz / POINTS, 9);
  });

  it.each([
    ['mains', mainsSyncSpec],
    ['ultrasonic', ultrasonicSinglePoleSpec],
    ['IF FM', ifFmDemodSpec],
  ] as const)('%s: the largest spur stays below NS87’s worst case −6.02·P + 3.92 dBc', (_name, spec) => {
    const s = ncoSpectrum(spec, POINTS);
    expect(s.spurEstimateDbc).toBeCloseTo(-6.02 * spec.nco.phaseBits, 9);
    expect(s.largestSpur).not.toBeNull();
    // NS87 bounds the truncation spur; window leakage of the 4-term Blackman–Harris is −92 dB (Ha78).
    expect(s.largestSpur!.levelDbc).toBeLessThan(s.spurWorstDbc! + 1);
    expect(s.largestSpur!.levelDbc).toBeGreaterThan(SPECTRUM_FLOOR_DBC);
  });

  it('uses the periodic 4-term Blackman–Harris window (SciPy blackmanharris, sym=False)', () => {
    const theirs = python<number[]>('from scipy.signal.windows import blackmanharris\nout = list(blackmanharris(64, sym=False))', null);
    const ours = blackmanHarris(64);
    theirs.forEach((v, i) => expect(ours[i]).toBeCloseTo(v, 12));
  });

  it('FFT matches numpy.fft.fft on a random complex vector of 256 points', () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31) - 0.5;
    const re = Float64Array.from({ length: 256 }, rand);
    const im = Float64Array.from({ length: 256 }, rand);
    const theirs = python<[number, number][]>('import numpy as np\nX = np.fft.fft(np.array(data[0]) + 1j*np.array(data[1]))\nout = [[float(v.real), float(v.imag)] for v in X]', [Array.from(re), Array.from(im)]);
    fftInPlace(re, im);
    theirs.forEach(([r, i], k) => {
      expect(re[k]).toBeCloseTo(r, 9);
      expect(im[k]).toBeCloseTo(i, 9);
    });
    expect(() => fftInPlace(new Float64Array(6), new Float64Array(6))).toThrow(/power of two/);
  });
});
