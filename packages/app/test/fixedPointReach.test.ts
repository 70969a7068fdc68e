/**
 * What the fixed-point loop can reach, on screen: the editor's and the release report's range figures
 * (rangeFigures serves both) state the fixed-point hold-in beside the float loop's unbounded PI
 * hold-in (G3 Ch. 2), and the simulation panel warns, naming the field by its label, when a scenario
 * asks for more (dsp analysis/fixedPointReach.ts).
 */
import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { analyzeDesign, mainsSyncSpec } from '@loopwright/dsp';
import SimulationPanel from '../src/components/SimulationPanel.vue';
import { rangeFigures } from '../src/components/analysisView.ts';

vi.mock('../src/workers/dspClient.ts', () => ({ jobWorker: () => ({ run: vi.fn() }) }));

const analysis = analyzeDesign(mainsSyncSpec);

describe('fixed-point reach on screen', () => {
  it('shows the hold-in the fixed-point loop keeps beside the unbounded ideal-PI estimate', () => {
    const rows = rangeFigures(analysis);
    expect(rows.find((r) => r.label === 'Hold-in range')?.value).toBe('unbounded (ideal PI)');
    const fixed = rows.find((r) => r.label === 'Hold-in, fixed point')!;
    expect(fixed.value).toMatch(/^±12\.9\d* Hz$/);
    expect(fixed.note).toContain('nco.gainHzPerUnit');
    expect(rows.find((r) => r.label === 'NCO reach, fixed point')?.value).toMatch(/^37\.\d+ Hz … 62\.\d+ Hz$/);
  });

  it('shows nothing of it for a release cut before the figure existed', () => {
    const { fixedPointReach: _dropped, ...old } = analysis;
    expect(rangeFigures(old as never).some((r) => r.label.includes('fixed point'))).toBe(false);
  });

  it('warns under the scenario form when a step asks for more than the fixed-point loop can hold', async () => {
    setActivePinia(createPinia());
    const wrapper = mount(SimulationPanel, { props: { spec: mainsSyncSpec, crossoverHz: analysis.margins.discrete.crossoverHz, reach: analysis.fixedPointReach } });
    expect(wrapper.find('[data-test="scenario-reach-warning"]').exists()).toBe(false);
    await wrapper.find('input[data-test="scenario-stepHz"]').setValue('25');
    await flushPromises();
    const text = wrapper.find('[data-test="scenario-reach-warning"]').text();
    expect(text).toMatch(/^Step size 25 Hz is beyond the ±12\.\d+ Hz the fixed-point loop can hold/);
  });
});
