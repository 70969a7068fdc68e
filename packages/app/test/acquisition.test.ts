/**
 * The acquisition table (editor panel, release and review pages) and the sweep in the simulation panel:
 * rows built from dsp's own comparison, a search limit shown as a limit and never as a figure (dsp
 * README "Acquisition"), and the panel's default sweep a valid scenario for every demo loop.
 */
import { describe, expect, it, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import ElementPlus from 'element-plus';
import { analyzeDesign, compareAcquisition, exampleSpecs, ifFmDemodSpec, mainsSyncSpec, measureAcquisition, parseScenario, simulate, type Scenario } from '@loopwright/dsp';
import { acquisitionRows } from '../src/components/acquisitionView.ts';
import AcquisitionTable from '../src/components/AcquisitionTable.vue';
import { defaultScenarioDraft, draftToScenario } from '../src/form/scenarioDraft.ts';
import { metricRows } from '../src/components/simulationView.ts';
import { traceOption } from '../src/charts/traceOption.ts';

vi.mock('../src/workers/dspClient.ts', () => ({ jobWorker: () => ({ run: vi.fn() }) }));

const comparisonOf = (spec: typeof mainsSyncSpec) => compareAcquisition(analyzeDesign(spec).estimates, measureAcquisition(spec));

describe('acquisition table', () => {
  const mains = comparisonOf(mainsSyncSpec);

  it('puts estimate and measured side by side, and names the limit where the PI loop still holds at the control range', () => {
    const rows = acquisitionRows(mains);
    expect(rows.map((r) => r.figure)).toEqual(['lock-in', 'pull-out', 'hold-in', 'pull-in']);
    // 2ζωn/2π = 2·0.707·5 Hz for the PI targets (G3, B6).
    expect(rows[0]!.estimate).toBe('7.07 Hz');
    expect(rows[0]!.measured).toMatch(/Hz$/);
    expect(rows[0]!.limit).toBe('');
    const hold = rows[2]!;
    expect(hold.estimate).toBe('—');
    expect(hold.measured).toMatch(/^≥ 20(\.0+)? Hz$/);
    expect(hold.limit).toMatch(/control word’s range/);
    expect(hold.bracket).toMatch(/none failed/);
  });

  it('carries every definition into its rows and says the estimates can be off by 2x', () => {
    expect(acquisitionRows(mains).map((r) => r.definition)).toEqual(mains.figures.map((f) => f.measured.definition));
    setActivePinia(createPinia());
    const w = mount(AcquisitionTable, { props: { acquisition: mains }, global: { plugins: [ElementPlus] } });
    expect(w.text()).toContain('up to 2x (Ku23)');
    expect(w.text()).toContain('type-2 loop');
  });
});

describe('sweep in the simulation panel', () => {
  it('starts from a default sweep that every demo loop accepts', () => {
    for (const e of exampleSpecs) {
      const crossoverHz = analyzeDesign(e.spec).margins.discrete.crossoverHz;
      const r = parseScenario(draftToScenario('sweep', defaultScenarioDraft(crossoverHz, e.spec.sampleRateHz)));
      expect(r.ok, `${e.spec.name}: ${r.ok ? '' : r.issues.map((i) => i.message).join('; ')}`).toBe(true);
    }
  });

  it('shows where lock was lost and regained, and draws the input frequency beside the NCO frequency', () => {
    // The IF demodulator (K·F(0) = 200 kHz, G3) swept to 300 kHz and back: lock goes and comes back.
    const scenario = { kind: 'sweep', fromHz: 0, toHz: 300e3, rateHzPerS: 3e8, durationS: 0.0025 } as Scenario;
    const result = simulate(ifFmDemodSpec, scenario, { buckets: 200 });
    const rows = metricRows(result);
    expect(rows.find((r) => r.testId === 'metric-sweep-lost')!.float).toMatch(/kHz at .*s$/);
    expect(rows.find((r) => r.testId === 'metric-sweep-regained')!.bitTrue).toMatch(/kHz at .*s$/);
    const option = traceOption({ float: result.float!.traces, bitTrue: result.bitTrue!.traces, modulatingHz: null, gainHzPerUnit: ifFmDemodSpec.nco.gainHzPerUnit, centerHz: ifFmDemodSpec.centerHz }) as {
      series: { name: string }[];
    };
    expect(option.series.map((s) => s.name)).toContain('Input frequency');
    // A tone has no sweep rows.
    const tone = simulate(ifFmDemodSpec, { kind: 'tone', offsetHz: 1e3, durationS: 1e-4 });
    expect(metricRows(tone).some((r) => r.testId.startsWith('metric-sweep'))).toBe(false);
  });
});
