/**
 * Closed-loop figures read off the squares of |H| (closedLoopFiguresOfOpen) are those of the
 * point-by-point definition, closedLoopFigures on closedDbOfOpen's dB values (Object.is on every
 * number): on the analog and discrete open loops of the demo specs and of seeded random specs, and on
 * made-up samples whose |H|² sits within a relative 1e-6 of the half-power bound or repeats its peak,
 * where the squares alone could not decide. The definition itself is checked against SciPy in
 * scipy-loops.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { closedLoopFigures, closedLoopFiguresOfOpen } from '../../src/analysis/closedLoopFigures.ts';
import { analogLoopResponse, closedDbOfOpen, closedLoop, discreteLoopResponse, type ResponseFn } from '../../src/analysis/response.ts';
import { logGrid } from '../../src/analysis/grid.ts';
import { type SampledPhase, samplePhase } from '../../src/analysis/bode.ts';
import { analysisRange } from '../../src/analysis/frequencyRange.ts';
import { planDesign } from '../../src/planDesign.ts';
import { parseLoopSpec } from '../../src/spec/schema.ts';
import { exampleSpecs } from '../../src/spec/examples.ts';
import { mulberry32, randomLoopSpec } from '../reference/random.ts';

interface Case {
  readonly label: string;
  readonly h: ResponseFn;
  readonly grid: readonly number[];
  readonly open: SampledPhase;
}

/** The analog loop on its grid and the designed discrete loop on fMin..fs/2, for demo and random specs. */
function loopCases(count: number): Case[] {
  const specs = exampleSpecs.map((e) => e.spec);
  const rnd = mulberry32(29);
  for (let i = 0; specs.length < count && i < 20 * count; i++) specs.push(randomLoopSpec(rnd, i));
  const out: Case[] = [];
  specs.forEach((input, n) => {
    const parsed = parseLoopSpec(input);
    if (!parsed.ok) return;
    const spec = parsed.spec;
    const filter = planDesign(spec).filter;
    const k = 2 * Math.PI * spec.nco.gainHzPerUnit * (spec.input.amplitude / 2);
    const range = analysisRange(filter.analogSections, k, spec.sampleRateHz);
    const analog = analogLoopResponse(filter.analogSections, k);
    const analogGrid = logGrid(range.fMinHz, range.fMaxAnalogHz, 600);
    out.push({ label: `analog ${n}`, h: closedLoop(analog), grid: analogGrid, open: samplePhase(analog, analogGrid, 1) });
    const discrete = discreteLoopResponse(filter.sections, k, spec.sampleRateHz);
    const grid = logGrid(range.fMinHz, spec.sampleRateHz / 2, 600);
    out.push({ label: `discrete ${n}`, h: closedLoop(discrete), grid, open: samplePhase(discrete, grid, 1) });
  });
  return out;
}

/**
 * Open-loop samples l = x/(1 − x) for x real: then H = l/(1 + l) = x up to rounding, so |H|² lands where
 * x² is put: a plateau of peaks equal or a unit in the last place apart, and points on either side of 1/2 by a few units in the last place.
 */
function edgeCase(rnd: () => number, label: string): Case {
  const n = 200;
  const grid = logGrid(1, 1e4, n);
  const re: number[] = [];
  const im: number[] = [];
  const peak = 1 + 2 * rnd();
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    let x: number;
    if (i >= 40 && i < 48) x = peak * (1 + (i % 4) * (rnd() < 0.5 ? 2 ** -52 : 0)); // a peak repeated, or a few units in the last place apart
    else if (i > 60 && i < 120) x = Math.SQRT1_2 * (1 + (Math.floor(rnd() * 9) - 4) * 2 ** -52 * (rnd() < 0.5 ? 1 : 1e6 * rnd()));
    else x = t < 0.2 ? 1 + t : Math.SQRT1_2 * (1 - t) * 2;
    re.push(x / (1 - x));
    im.push(rnd() < 0.3 ? 0 : 1e-9 * rnd());
  }
  const fn: ResponseFn = (f) => ({ re: 1 / (1e-3 * f), im: -1 / (1e-3 * f) });
  return { label, h: closedLoop(fn), grid, open: { freqHz: grid, phaseDeg: grid.map(() => 0), re, im } };
}

const CASES: Case[] = [...loopCases(40)];
const rnd = mulberry32(7);
for (let i = 0; i < 200; i++) CASES.push(edgeCase(rnd, `edge ${i}`));

describe('closed-loop figures from the squares of |H|', () => {
  it.each(CASES.map((c) => [c.label, c] as const))('%s: the figures of the dB values, bit for bit', (_label, c) => {
    const expected = closedLoopFigures(c.h, c.grid, closedDbOfOpen(c.open), true);
    expect(closedLoopFiguresOfOpen(c.h, c.grid, c.open, true)).toEqual(expected);
  });

  it('uses the dB path where a square over- or underflows, and has no figures for an unstable loop', () => {
    const c = edgeCase(mulberry32(3), 'tiny');
    const re = c.open.re.map((x, i) => (i === 5 ? 1e-160 : x));
    const open = { ...c.open, re, im: c.open.im.map((x, i) => (i === 5 ? 0 : x)) };
    expect(closedLoopFiguresOfOpen(c.h, c.grid, open, true)).toEqual(closedLoopFigures(c.h, c.grid, closedDbOfOpen(open), true));
    expect(closedLoopFiguresOfOpen(c.h, c.grid, open, false).peakingDb).toBeNull();
  });
});
