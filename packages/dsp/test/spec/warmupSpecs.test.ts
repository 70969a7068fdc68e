/**
 * The specs a worker warms up on (src/spec/warmupSpecs.ts): each passes the spec schema (DESIGN.md
 * fields), none is a demo example, and together they take every option the schema offers where a
 * spec chooses a code path (filter kind, ripple filter order, waveform, rounding, overflow), so a
 * user's first analysis meets compiled code whichever it picks (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { loopFilterSchema, loopSpecSchema, parseLoopSpec, requireValidSpec, type LoopSpec } from '../../src/spec/schema.ts';
import { WIDTH_LIMITS } from '../../src/spec/limits.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';
import { WARMUP_PASSES, warmupSequence, warmupSimulations, warmupSpecs } from '../../src/spec/warmupSpecs.ts';
import { analyzeDesign, planDesign, simulatePlan } from '../../src/planDesign.ts';
import { parseScenario, scenarioSchema } from '../../src/spec/scenario.ts';

const parsed = warmupSpecs.map((s) => {
  const r = parseLoopSpec(s);
  if (!r.ok) throw new Error(`${String(s.name)}: ${r.issues.map((i) => i.message).join('; ')}`);
  return r.spec as LoopSpec;
});

const range = ([lo, hi]: readonly [number, number]) => Array.from({ length: hi - lo + 1 }, (_, i) => lo + i);

describe('warm-up specs', () => {
  it.each(warmupSpecs.map((s) => [s.name, s] as const))('%s passes the spec schema', (_name, spec) => {
    expect(parseLoopSpec(spec).ok).toBe(true);
  });

  it('are not the demo examples, so a demo spec still meets its first call', () => {
    const demoNames = new Set(exampleSpecs.map((e) => e.spec.name));
    const demoJson = new Set(exampleSpecs.map((e) => JSON.stringify(e.spec)));
    for (const spec of parsed) {
      expect(demoNames.has(spec.name)).toBe(false);
      expect(demoJson.has(JSON.stringify(spec))).toBe(false);
    }
  });

  it('take every filter kind, and second-order filters both from time constants and from targets', () => {
    const kinds = loopFilterSchema.options.map((o) => o.shape.kind.value);
    expect(new Set(parsed.map((s) => s.filter.kind))).toEqual(new Set(kinds));
    const secondOrder = parsed.flatMap((s) => (s.filter.kind === 'pi' || s.filter.kind === 'lag-lead' ? [s.filter] : []));
    expect(secondOrder.some((f) => f.tau1S !== undefined)).toBe(true);
    expect(secondOrder.some((f) => f.naturalHz !== undefined)).toBe(true);
  });

  it('take every ripple filter order and none, prewarping on and off, fixed and automatic fraction bits', () => {
    const orders = new Set(parsed.map((s) => s.rippleFilter?.order ?? null));
    expect(orders).toEqual(new Set([null, ...range(WIDTH_LIMITS['filter.order'])]));
    expect(new Set(parsed.map((s) => s.discretization.prewarpHz === null))).toEqual(new Set([true, false]));
    expect(new Set(parsed.map((s) => s.fixedPoint.coefficientFractionBits === 'auto'))).toEqual(new Set([true, false]));
  });

  it('take every waveform, rounding and overflow the schema offers', () => {
    const shape = loopSpecSchema.shape;
    expect(new Set(parsed.map((s) => s.nco.waveform))).toEqual(new Set(shape.nco.shape.waveform.options));
    expect(new Set(parsed.map((s) => s.fixedPoint.rounding))).toEqual(new Set(shape.fixedPoint.shape.rounding.options));
    expect(new Set(parsed.map((s) => s.fixedPoint.overflow))).toEqual(new Set(shape.fixedPoint.shape.overflow.options));
  });

  it('include a spec whose quantisation fails and specs the analysis warns about', () => {
    const analyses = parsed.map((s) => analyzeDesign(s));
    expect(analyses.some((a) => a.quantization.error !== null)).toBe(true);
    expect(analyses.some((a) => a.warnings.length > 0)).toBe(true);
  });

  it('are analysed WARMUP_PASSES times over, each pass in the same order (warmupSequence)', () => {
    expect(WARMUP_PASSES).toBeGreaterThan(1);
    expect(warmupSequence).toHaveLength(WARMUP_PASSES * warmupSpecs.length);
    warmupSequence.forEach((spec, i) => expect(spec).toBe(warmupSpecs[i % warmupSpecs.length]));
  });

  it('simulate every scenario kind, briefly, on warm-up specs only, without a warning', () => {
    const kinds = scenarioSchema.options.map((o) => o.shape.kind.value);
    expect(new Set(warmupSimulations.map((w) => w.scenario.kind))).toEqual(new Set(kinds));
    for (const { spec, scenario } of warmupSimulations) {
      expect(warmupSpecs).toContain(spec);
      const parsed = parseScenario(scenario);
      if (!parsed.ok) throw new Error(`${scenario.kind}: ${parsed.issues.map((i) => i.message).join('; ')}`);
      const result = simulatePlan(planDesign(requireValidSpec(spec)), parsed.scenario, { mode: 'both' });
      expect(result.bitTrue).not.toBeNull();
      expect(result.warnings).toEqual([]);
      expect(result.sampleCount).toBeLessThanOrEqual(5000);
    }
  });
});
