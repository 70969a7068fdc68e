/**
 * A compute thread keeps the last simulated spec's plan (workers/compute.ts): every answer is still
 * the one a fresh planning of its own spec gives, whatever spec came before it; a spec that differs
 * in one number or in its members' order is planned afresh, and a bad spec
 * after a good one still fails naming its field (the plan is a pure function of the spec; no outside source).
 */
import { mainsSyncSpec, parseScenario, planDesign, requireValidSpec, simulatePlan, type LoopSpec } from '@loopwright/dsp';
import { valueSymbol } from 'piscina';
import { describe, expect, it } from 'vitest';
import { runComputeTask } from '../src/workers/compute.ts';
import { typedArraysAsArrays } from './typedArraysAsArrays.ts';

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
  return typedArraysAsArrays(simulatePlan(planDesign(requireValidSpec(spec)), parsed.scenario, options));
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

  it("gives a half run's plan member the text of a fresh plan's, after the same spec and after another", () => {
    // The bit-true half's plan JSON is kept with the plan (workers/compute.ts encodedMember).
    const planText = (spec: unknown): string => {
      const moving = runComputeTask({ kind: 'simulation', spec, scenario, options: { ...options, mode: 'bit-true' }, half: true });
      // A half's answer comes wrapped for Piscina to move its bytes (movedBytes.ts).
      const outcome = ((moving as unknown as Record<symbol, unknown>)[valueSymbol] ?? moving) as typeof moving;
      if (!outcome.ok || outcome.kind !== 'simulationHalf' || !outcome.half.plan) throw new Error(`no half: ${JSON.stringify(outcome)}`);
      return new TextDecoder().decode(outcome.half.plan);
    };
    const freshPlan = (spec: LoopSpec): string => typedArraysAsArrays(planDesign(requireValidSpec(spec)).bitTrue);
    expect(freshPlan(retuned)).not.toBe(freshPlan(mainsSyncSpec));
    for (const spec of [mainsSyncSpec, mainsSyncSpec, retuned, retuned, mainsSyncSpec, structuredClone(mainsSyncSpec)]) {
      expect(planText(spec)).toBe(freshPlan(spec));
    }
  });

  it('fails a bad spec after a good one, naming its field', () => {
    answered(mainsSyncSpec);
    const outcome = runComputeTask({ kind: 'simulation', spec: { ...mainsSyncSpec, centerHz: -1 }, scenario, options });
    expect(outcome.ok === false && 'issues' in outcome ? outcome.issues.map((i) => i.field) : []).toContain('centerHz');
  });
});
