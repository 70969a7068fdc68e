/**
 * The simulation panel's metrics: the demo FM scenario of the IF demodulator reads "Locked: yes" with
 * a lock time, and the panel says what Locked and Lock time mean (REFERENCES.md, "Lock and lock time").
 */
import { describe, expect, it, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { analyzeDesign, ifFmDemodSpec, LOCK_DEFINITION, simulate, type Scenario } from '@loopwright/dsp';
import SimulationPanel from '../src/components/SimulationPanel.vue';
import { useSimulationStore } from '../src/stores/useSimulationStore.ts';
import { defaultScenarioDraft, draftToScenario } from '../src/form/scenarioDraft.ts';
import { lockDefinitionText, metricRows } from '../src/components/simulationView.ts';

vi.mock('../src/workers/dspClient.ts', () => ({ jobWorker: () => ({ run: vi.fn() }) }));

describe('simulation metrics on screen', () => {
  // The panel's own default FM scenario for the IF demodulator (rate crossover/8, deviation 0.3·crossover).
  const crossoverHz = analyzeDesign(ifFmDemodSpec).margins.discrete.crossoverHz;
  const scenario = draftToScenario('fm-sine', defaultScenarioDraft(crossoverHz, ifFmDemodSpec.sampleRateHz)) as Scenario;
  const result = simulate(ifFmDemodSpec, scenario);

  it('reads Locked: yes with a lock time for the IF demodulator under its own FM scenario', () => {
    const rows = metricRows(result);
    const locked = rows.find((r) => r.testId === 'metric-locked')!;
    expect([locked.float, locked.bitTrue]).toEqual(['yes', 'yes']);
    const time = rows.find((r) => r.testId === 'metric-lock-time')!;
    expect(time.float).toMatch(/s$/);
    expect(time.bitTrue).toMatch(/s$/);
  });

  it('says under the table what Locked and Lock time mean, with the tolerance used', async () => {
    setActivePinia(createPinia());
    const sim = useSimulationStore();
    sim.output = { result, offsetHz: null } as never;
    const wrapper = mount(SimulationPanel, { props: { spec: ifFmDemodSpec, crossoverHz }, global: { stubs: { LwChart: true } } });
    await wrapper.vm.$nextTick();
    const text = wrapper.find('[data-test="lock-definition"]').text();
    expect(text).toContain(LOCK_DEFINITION);
    expect(text).toContain('±0.10 rad (±5.7°)');
    expect(lockDefinitionText(result)).toBe(text);
  });
});
