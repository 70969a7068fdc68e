/**
 * The new plots' data: the conformance window around a first mismatch (from a hand-made golden CSV,
 * common practice, no source), and the chart options built from the demo specs' analysis (each
 * series holds what dsp computed; the unit circle has radius 1; the spur estimate is NS87's −6.02·P).
 */
import { describe, expect, it } from 'vitest';
import { mainsSyncSpec, ncoSpectrum, planDesign, requireValidSpec } from '@loopwright/dsp';
import { mismatchWindow } from '../src/views/conformancePlot.ts';
import { closedLoopOption } from '../src/charts/closedLoopOption.ts';
import { poleZeroOption } from '../src/charts/poleZeroOption.ts';
import { spectrumOption } from '../src/charts/spectrumOption.ts';
import { stepOption } from '../src/charts/stepOption.ts';

const CSV = ['sample,input_code,nco_phase,table_address,nco_code,detector_code,filter_code', ...Array.from({ length: 100 }, (_, i) => `${i},0,0,0,0,0,${i * 10}`)].join('\n');

describe('the window around the first mismatch', () => {
  it('holds golden and uploaded values of the mismatching column, known up to the last listed mismatch', () => {
    const run = { mismatchCount: 3, firstMismatches: [50, 51].map((s) => ({ sampleIndex: s, column: 'filter_code', expected: String(s * 10), got: String(s * 10 - 1) })) };
    const w = mismatchWindow(CSV, run, 4)!;
    expect(w.column).toBe('filter_code');
    expect(w.samples).toEqual([46, 47, 48, 49, 50, 51, 52, 53, 54]);
    expect(w.golden).toEqual([460, 470, 480, 490, 500, 510, 520, 530, 540]);
    // Three mismatches found, two listed: after sample 51 the capture is unknown.
    expect(w.uploaded).toEqual([460, 470, 480, 490, 499, 509, null, null, null]);
    expect(w.mismatchSamples).toEqual([50, 51]);
  });

  it('knows every uploaded value when all mismatches are listed, and is null for a bit-exact run', () => {
    const run = { mismatchCount: 1, firstMismatches: [{ sampleIndex: 98, column: 'filter_code', expected: '980', got: '981' }] };
    const w = mismatchWindow(CSV, run, 4)!;
    expect(w.samples).toEqual([94, 95, 96, 97, 98, 99]);
    expect(w.uploaded).toEqual([940, 950, 960, 970, 981, 990]);
    expect(mismatchWindow(CSV, { mismatchCount: 0, firstMismatches: [] })).toBeNull();
  });
});

describe('chart options of the mains demo spec', () => {
  const spec = requireValidSpec(mainsSyncSpec);
  const a = planDesign(spec).analysis;
  type Series = { name: string; data: [number, number][] };

  it('closed loop and error transfer carry dsp’s |H| and |E| in dB', () => {
    const series = (closedLoopOption(a.bode) as { series: Series[] }).series;
    expect(series.map((s) => s.name)).toEqual(['|H| closed loop, discrete', '|H| analog prototype', '|E| error transfer, discrete', '|E| analog prototype']);
    expect(series[2]!.data[0]).toEqual([a.bode.freqHz[0], a.bode.discreteErrorDb[0]]);
  });

  it('the step plot starts at t = 0 with the full 1 rad error of the phase step', () => {
    const series = (stepOption(a.stepResponses) as { series: Series[] }).series;
    expect(series[0]!.data[0]![0]).toBe(0);
    expect(series[0]!.data.length).toBe(a.stepResponses.timeS.length);
  });

  it('the z-plane has one plot per section with the unit circle and both sets of poles', () => {
    const filter = a.quantization.filter!;
    const series = (poleZeroOption(filter) as { series: Series[] }).series;
    expect(series).toHaveLength(5 * filter.sections.length);
    const circle = series[0]!.data;
    expect(circle.every(([x, y]) => Math.abs(Math.hypot(x, y) - 1) < 1e-12)).toBe(true);
    // The PI section keeps its integrator pole at z = 1 in both forms.
    expect(series[1]!.data.some(([x, y]) => Math.abs(x - 1) < 1e-9 && y === 0)).toBe(true);
    expect(series[3]!.data.some(([x, y]) => Math.abs(x - 1) < 1e-9 && y === 0)).toBe(true);
  });

  it('the spectrum marks NS87’s spur estimate −6.02·P dBc', () => {
    const option = spectrumOption(ncoSpectrum(spec)) as { series: { markLine: { data: { yAxis: number }[] } }[] };
    expect(option.series[0]!.markLine.data[0]!.yAxis).toBeCloseTo(-6.02 * spec.nco.phaseBits, 9);
  });
});
