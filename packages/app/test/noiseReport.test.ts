/**
 * The data-path noise report and the word-length curve's noise: rows laid out from the dsp analysis's
 * own figures (quantization.noise, packages/dsp README "Data-path noise and scaling"), nothing
 * recomputed in the app.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, mainsSyncSpec, type WordLengthResult } from '@loopwright/dsp';
import { noiseFigures, noisePointRows, sectionScalingRows } from '../src/components/noiseView.ts';
import { dataCurveOption, widthVerdictRows } from '../src/components/wordLengthView.ts';

const noise = analyzeDesign(mainsSyncSpec).quantization.noise!;

describe('data-path noise report', () => {
  it('has one row per rounding point and one per section, in the analysis order', () => {
    const points = noisePointRows(noise);
    expect(points.map((p) => p.point)).toEqual(noise.points.map((p) => p.label));
    expect(sectionScalingRows(noise).map((s) => s.section)).toEqual(noise.sections.map((s) => `S${s.section + 1}`));
  });

  it('gives shares of the output noise that add up to the points’ part of it', () => {
    const shares = noisePointRows(noise).map((p) => Number.parseFloat(p.outputShare));
    const pointsPart = 100 * (1 - noise.rippleMixVariance / noise.outputNoiseVariance);
    expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo(pointsPart, 0);
  });

  it('states the SNR, jitter and dynamic range the analysis computed, and flags a section without headroom', () => {
    const figures = noiseFigures(noise);
    expect(figures.find((f) => f.label.startsWith('Roundoff SNR'))!.value).toBe(`${noise.outputSnrDb.toFixed(1)} dB`);
    expect(figures.find((f) => f.label === 'Data-path dynamic range')!.value).toBe(`${noise.dynamicRangeDb.toFixed(1)} dB`);
    const rows = sectionScalingRows(noise);
    noise.sections.forEach((s, i) => {
      expect(rows[i]!.ok).toBe(!s.mayOverflow);
      expect(rows[i]!.shift).toBe(s.shiftBits === 0 ? 'none' : `>> ${s.shiftBits}`);
    });
  });
});

describe('word-length curve with the predicted noise', () => {
  const r = {
    coefficients: { curve: [], minBits: null, note: null },
    data: {
      minBits: 10,
      curve: [8, 10, 12].map((dataBits) => ({ dataBits, steadyStatePhaseErrorDeg: 0.1, phaseJitterDeg: 0.2, predictedSnrDb: 6.02 * dataBits, predictedPhaseJitterDeg: 0.5 / dataBits, passes: true, reasons: [] })),
    },
  } as unknown as WordLengthResult;

  it('draws the predicted SNR on its own right-hand axis beside the simulated phase figures', () => {
    const option = dataCurveOption(r) as { yAxis: { name: string; position?: string }[]; series: { name: string; yAxisIndex?: number; data: [number, number | null][] }[] };
    expect(option.yAxis[1]).toMatchObject({ name: 'Roundoff SNR (dB)', position: 'right' });
    const snr = option.series.find((s) => s.name === 'Predicted roundoff SNR')!;
    expect(snr.yAxisIndex).toBe(1);
    expect(snr.data).toEqual([8, 10, 12].map((d) => [d, 6.02 * d]));
  });

  it('puts the predicted SNR and jitter in each data width’s row, none in a coefficient row', () => {
    const rows = widthVerdictRows(r);
    expect(rows.map((x) => x.snr)).toEqual(['48.2 dB, 0.063° RMS', '60.2 dB, 0.05° RMS', '72.2 dB, 0.042° RMS']);
  });
});
