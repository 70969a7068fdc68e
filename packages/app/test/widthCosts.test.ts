/** The word-length search's cost column: candidate specs per width, and the server's estimates beside the error figures (common practice, no source). */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { mainsSyncSpec, type WordLengthResult } from '@loopwright/dsp';
import { estimatesApi } from '../src/api/estimatesApi.ts';
import { useWidthCostStore } from '../src/stores/useWidthCostStore.ts';
import { costedWidths, widthCandidates, widthCostRows } from '../src/components/widthCostView.ts';

const result = {
  reference: { phaseMarginDeg: 60, gainMarginDb: null, crossoverHz: 5 },
  tolerances: { phaseMarginDeg: 2, responseDb: 0.5, phaseErrorDeg: 0.5 },
  coefficients: {
    curve: [
      { coefficientBits: 15, fractionBits: 13, stable: true, phaseMarginDeg: 55, gainMarginDb: null, crossoverHz: 5, phaseMarginErrorDeg: -5, maxDeviationDb: 1.2, passes: false, reasons: [] },
      { coefficientBits: 16, fractionBits: 14, stable: true, phaseMarginDeg: 59.9, gainMarginDb: null, crossoverHz: 5, phaseMarginErrorDeg: -0.1, maxDeviationDb: 0.01, passes: true, reasons: [] },
    ],
    minBits: 16,
    note: null,
  },
  data: { curve: [{ dataBits: 14, accumulatorBits: 40, locked: true, steadyStatePhaseErrorDeg: 0.1, phaseJitterDeg: 0.2, cycleSlips: 0, passes: true, reasons: [] }], minBits: 14, coefficientBits: 18, note: null },
} as unknown as WordLengthResult;

const estimated = { state: 'estimated' as const, tool: 'Yosys 0.23', label: 'Estimate for a generic small FPGA', total: { generic: { luts: 6643, flipFlops: 383, multipliers: 4, romBits: 65536 }, ice40: { luts: 842, flipFlops: 368, carries: 307, dspBlocks: 7, ramBlocks: 16 } } };

describe('width costs', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    vi.restoreAllMocks();
  });

  it('costs the widths around the cheapest passing one and the spec\'s own, or the widest when none passes', () => {
    const widths = [6, 8, 10, 12, 14, 16, 18, 20, 22, 24];
    expect([...costedWidths(widths, 12, 18)].sort((a, b) => a - b)).toEqual([12, 14, 16, 18]);
    expect([...costedWidths(widths, 12, 24)].sort((a, b) => a - b)).toEqual([12, 14, 16, 24]);
    expect([...costedWidths(widths, null, 99)].sort((a, b) => a - b)).toEqual([20, 22, 24]);
  });

  it('makes one candidate spec per width, with the fraction bits and MAC word the search used', () => {
    const c = widthCandidates(result, mainsSyncSpec);
    expect(c.map((x) => [x.kind, x.bits])).toEqual([['coefficients', 15], ['coefficients', 16], ['data', 14]]);
    expect(c[1]!.spec.fixedPoint).toMatchObject({ coefficientBits: 16, coefficientFractionBits: 14, dataBits: 16 });
    expect(c[2]!.spec.fixedPoint).toMatchObject({ dataBits: 14, accumulatorBits: 40, coefficientBits: 18 });
  });

  it('asks again while the server is estimating, then shows the figures beside the errors', async () => {
    const candidates = widthCandidates(result, mainsSyncSpec);
    const ask = vi
      .spyOn(estimatesApi, 'candidates')
      .mockResolvedValueOnce([{ state: 'pending' }, estimated, { state: 'not-estimated', reason: 'yosys is not installed' }])
      .mockResolvedValueOnce([estimated, estimated, { state: 'not-estimated', reason: 'yosys is not installed' }]);
    const store = useWidthCostStore();
    await store.follow(candidates, 1);
    expect(ask).toHaveBeenCalledTimes(2);
    const rows = widthCostRows(candidates, store.costs);
    expect(rows.map((r) => [r.width, r.passes, r.luts, r.multipliers, r.ice40Dsp, r.note])).toEqual([
      ['coefficients 15 bits', 'no', '6643', '4', '7', ''],
      ['coefficients 16 bits', 'yes', '6643', '4', '7', ''],
      ['data 14 bits (MAC 40)', 'yes', '—', '—', '—', 'not estimated: yosys is not installed'],
    ]);
    expect(rows[0]!.error).toBe('PM error -5.00 °, response 1.200 dB');
  });
});
