/**
 * The analysis warns, naming clockHz, when the fabric clock leaves fewer clocks per loop update than
 * the release's reference RTL needs (6 per section + 3: the architecture of our own templates, no
 * outside source; the api's RTL tests prove the figure exact in GHDL and Icarus).
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, ifFmDemodSpec, mainsSyncSpec, referenceRtlTiming, referenceRtlWarnings } from '../../src/index.ts';

describe('referenceRtlTiming', () => {
  it('counts 6 clocks per section plus 3, and one multiplier per section plus 2', () => {
    expect(referenceRtlTiming(1)).toEqual({ sectionCount: 1, cyclesPerSample: 9, latencyCycles: 7, multipliers: 3 });
    expect(referenceRtlTiming(4)).toEqual({ sectionCount: 4, cyclesPerSample: 27, latencyCycles: 25, multipliers: 6 });
  });

  it('refuses a section count that is not a whole number of at least 1', () => {
    expect(() => referenceRtlTiming(0)).toThrow(/sectionCount/);
    expect(() => referenceRtlTiming(1.5)).toThrow(/sectionCount/);
  });
});

describe('the clocks-per-update warning', () => {
  it('names clockHz when the IF demodulator updates on every clock of its 100 MHz fabric', () => {
    const warning = analyzeDesign(ifFmDemodSpec).warnings.find((w) => w.field === 'clockHz');
    expect(warning?.message).toMatch(/leaves 1 clock per loop update, but the release's reference RTL needs 9 \(6 per second-order section × 1 \+ 3\)/);
  });

  it('stays quiet for the mains loop, which has 10000 clocks per update', () => {
    expect(analyzeDesign(mainsSyncSpec).warnings.filter((w) => w.field === 'clockHz')).toEqual([]);
  });

  it('is silent at exactly the clocks needed and speaks one clock short', () => {
    const needed = referenceRtlTiming(2).cyclesPerSample;
    expect(referenceRtlWarnings({ clockHz: needed * 1000, sampleRateHz: 1000 }, 2)).toEqual([]);
    expect(referenceRtlWarnings({ clockHz: needed * 1000 - 1, sampleRateHz: 1000 }, 2)).toHaveLength(1);
  });
});
