/**
 * The editor's Bode plot is drawn thinned while no pointer is over it and with every grid point while
 * one is, so the tooltip reads each frequency of the grid. Expected values come from bodeOption itself.
 */
import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick } from 'vue';
import { mount } from '@vue/test-utils';
import { mainsSyncSpec } from '@loopwright/dsp';
import BodePanel from '../src/components/BodePanel.vue';
import { analyzeJob } from '../src/workers/dspJobs.ts';

/** Stands in for the chart: keeps the option it was given. */
const ChartStub = defineComponent({
  name: 'LwChart',
  props: { option: { type: Object, required: true } },
  setup: () => () => h('div', { class: 'chart-stub' }),
});

type Option = { series: { data: Float64Array }[] };

describe('the editor Bode plot under the pointer', () => {
  it('draws every grid point while a pointer is over it, and the thinned lines otherwise', async () => {
    const analysis = analyzeJob(mainsSyncSpec);
    const wrapper = mount(BodePanel, { props: { analysis, generation: 1 }, global: { stubs: { LwChart: ChartStub } } });
    const points = () => (wrapper.findComponent(ChartStub).props('option') as Option).series[0]!.data.length / 2;
    const gridPoints = analysis.analysis.bode.freqHz.length;
    expect(points()).toBeLessThan(gridPoints);
    await wrapper.find('.chart-stub').element.parentElement!.dispatchEvent(new Event('pointerenter'));
    await nextTick();
    expect(points()).toBe(gridPoints);
    await wrapper.find('.chart-stub').element.parentElement!.dispatchEvent(new Event('pointerleave'));
    await nextTick();
    expect(points()).toBeLessThan(gridPoints);
    wrapper.unmount();
  });
});
