/**
 * A 'both' simulation split in two (a mode 'float' and a mode 'bit-true' run, as the server and the
 * editor run them on two cores) and merged is the sequential 'both' run itself: every trace, metric,
 * record, checksum and the plan, bit for bit (the property that makes the split allowed; no outside
 * source), for every demo spec, both kernels and scenarios that cross chunks (tone, step, noisy FM, sweep).
 */
import { describe, expect, it } from 'vitest';
import { planDesign, simulatePlan } from '../../src/planDesign.ts';
import { exampleSpecs, ifFmDemodSpec, mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { requireValidSpec, type LoopSpec } from '../../src/spec/schema.ts';
import type { Scenario } from '../../src/spec/scenario.ts';
import type { SimOptions } from '../../src/types/sim.ts';
import { simulateLoop } from '../../src/sim/simulate.ts';
import { mergeSimResults } from '../../src/sim/mergeSimResults.ts';

function loopOf(spec: LoopSpec) {
  const plan = planDesign(requireValidSpec(spec));
  return { plan, loop: { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue } };
}

/** The sequential run and the merge of its halves, each half run on its own. */
function bothWays(spec: LoopSpec, scenario: Scenario, options: SimOptions = {}) {
  const { loop } = loopOf(spec);
  const sequential = simulateLoop(loop, scenario, { ...options, mode: 'both' });
  const merged = mergeSimResults(simulateLoop(loop, scenario, { ...options, mode: 'float' }), simulateLoop(loop, scenario, { ...options, mode: 'bit-true' }));
  return { sequential, merged };
}

const cases: readonly { readonly name: string; readonly spec: LoopSpec; readonly scenario: Scenario; readonly options?: SimOptions }[] = [
  { name: 'a tone', spec: mainsSyncSpec, scenario: { kind: 'tone', offsetHz: 1, durationS: 3 } },
  { name: 'a frequency step, every sample kept', spec: ultrasonicSinglePoleSpec, scenario: { kind: 'frequency-step', stepHz: 300, atS: 0.002, durationS: 0.03 }, options: { keepRecord: true, fullTraces: true } },
  { name: 'FM with noise', spec: ifFmDemodSpec, scenario: { kind: 'fm', modulation: 'sine', rateHz: 1e4, deviationHz: 5e4, durationS: 2e-4, snrDb: 20, seed: 7 }, options: { buckets: 300 } },
  { name: 'a sweep', spec: mainsSyncSpec, scenario: { kind: 'sweep', fromHz: 0, toHz: 8, rateHzPerS: 8, durationS: 2 } },
  { name: 'a phase step with the record', spec: mainsSyncSpec, scenario: { kind: 'phase-step', stepDeg: 40, atS: 0.3, durationS: 2 }, options: { keepRecord: true, lockToleranceRad: 0.05 } },
];

describe('mergeSimResults: the halves of a split run make the sequential run', () => {
  for (const kernel of ['wasm', 'typescript'] as const) {
    for (const c of cases) {
      it(`${c.name} (${kernel} kernel)`, () => {
        const { sequential, merged } = bothWays(c.spec, c.scenario, { ...c.options, bitTrueKernel: kernel });
        expect(sequential.sampleCount).toBeGreaterThan(16_384);
        // toStrictEqual compares every typed array element by Object.is (so −0 and NaN too); the JSON
        // text (what the server sends) also keeps the members' order.
        expect(merged).toStrictEqual(sequential);
        expect(JSON.stringify(merged)).toBe(JSON.stringify(sequential));
        expect(merged.bitTrue!.checksum).toBe(sequential.bitTrue!.checksum);
      });
    }
  }

  it('keeps the warnings of simulatePlan, for each demo spec', () => {
    for (const e of exampleSpecs) {
      const plan = planDesign(requireValidSpec(e.spec));
      // Far beyond the hold range, so a reach warning is likely where the fixed-point loop has one.
      const scenario: Scenario = { kind: 'tone', offsetHz: e.spec.nco.gainHzPerUnit * 0.9, durationS: 20_000 / e.spec.sampleRateHz };
      const sequential = simulatePlan(plan, scenario);
      expect(sequential.warnings!.length).toBeGreaterThan(0);
      const merged = mergeSimResults(simulatePlan(plan, scenario, { mode: 'float' }), simulatePlan(plan, scenario, { mode: 'bit-true' }));
      expect(JSON.stringify(merged)).toBe(JSON.stringify(sequential));
      expect(merged).toStrictEqual(sequential);
    }
  });

  it('refuses parts of different runs or in the wrong places', () => {
    const { loop } = loopOf(mainsSyncSpec);
    const tone = (durationS: number, mode: SimOptions['mode']) => simulateLoop(loop, { kind: 'tone', offsetHz: 0, durationS }, { mode, buckets: 10 });
    expect(() => mergeSimResults(tone(1, 'float'), tone(2, 'bit-true'))).toThrow(/different runs/);
    expect(() => mergeSimResults(tone(1, 'bit-true'), tone(1, 'float'))).toThrow(/float-only/);
    expect(() => mergeSimResults(tone(1, 'float'), tone(1, 'both'))).toThrow(/bit-true-only/);
  });
});
