/**
 * A compute thread keeps the last simulated spec's plan (workers/compute.ts): every answer is still
 * the one a fresh planning of its own spec gives, whatever spec came before it; a spec that differs
 * in one number or in its members' order is planned afresh, and a bad spec
 * after a good one still fails naming its field (the plan is a pure function of the spec; no outside source).
 */
import { mainsSyncSpec, parseScenario, planDesign, requireValidSpec, simulatePlan, type LoopSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { runComputeTask } from '../src/workers/compute.ts';

const scenario = { kind: 'tone', offsetHz: 1, durationS: 0.5 };
const options = { buckets: 100 };

/** The answer of this thread's task function, as text. */
function answered(spec: unknown): string {
  const outcome = runComputeTask({ kind: 'simulation', spec, scenario, options });
  if (!outcome.ok || outcome.kind !== 'simulation') throw new Error(`no simulation: ${JSON.stringify(outcome)}`);
  return new TextDecoder().decode(outcome.simulationJson);
}

/** The answer of a plan made here and now. */
function fresh(spec: LoopSpec): string {
  const parsed = parseScenario(scenario);
  if (!parsed.ok) throw new Error('bad scenario');
  return JSON.stringify(simulatePlan(planDesign(requireValidSpec(spec)), parsed.scenario, options));
}

describe('the plan a compute thread keeps', () => {
  const retuned: LoopSpec = { ...mainsSyncSpec, centerHz: mainsSyncSpec.centerHz * 1.02 };
  const reordered = Object.fromEntries(Object.entries(mainsSyncSpec).reverse()) as LoopSpec;

  it('answers each spec as a fresh plan of it does, after the same spec and after another', () => {
    expect(fresh(retuned)).not.toBe(fresh(mainsSyncSpec));
    for (const spec of [mainsSyncSpec, mainsSyncSpec, retuned, mainsSyncSpec, reordered, retuned, structuredClone(mainsSyncSpec)]) {
      expect(answered(spec)).toBe(fresh(spec));
    }
  });

  it('fails a bad spec after a good one, naming its field', () => {
    answered(mainsSyncSpec);
    const outcome = runComputeTask({ kind: 'simulation', spec: { ...mainsSyncSpec, centerHz: -1 }, scenario, options });
    expect(outcome.ok === false && 'issues' in outcome ? outcome.issues.map((i) => i.field) : []).toContain('centerHz');
  });
});
