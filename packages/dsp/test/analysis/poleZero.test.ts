/**
 * Poles and zeros per section for the z-plane plot (src/analysis/poleZero.ts) against numpy.roots, on
 * the demo specs' designed sections and on hand-made first-order and double-root sections; and the
 * error transfer against E = 1 − H (an identity of the loop, G3 Ch. 2).
 */
import { describe, expect, it } from 'vitest';
import { exampleSpecs } from '../../src/spec/examples.ts';
import { planDesign } from '../../src/planDesign.ts';
import { requireValidSpec } from '../../src/spec/schema.ts';
import { sectionPolesZeros } from '../../src/analysis/poleZero.ts';
import type { Sos } from '../../src/types/filter.ts';
import { python } from '../fixed/python.ts';

type Root = { re: number; im: number };
const sorted = (r: readonly Root[]) => [...r].sort((a, b) => a.re - b.re || a.im - b.im);

function numpyRoots(polys: number[][]): Root[][] {
  return python<Root[][]>(
    'import numpy as np\nout = [[{"re": float(r.real), "im": float(r.imag)} for r in np.roots(c)] for c in data]',
    polys,
  );
}

function expectRoots(ours: readonly Root[], theirs: readonly Root[]): void {
  expect(ours).toHaveLength(theirs.length);
  const a = sorted(ours);
  const b = sorted(theirs);
  a.forEach((r, i) => {
    expect(r.re).toBeCloseTo(b[i]!.re, 7);
    expect(Math.abs(r.im)).toBeCloseTo(Math.abs(b[i]!.im), 7);
  });
}

describe('section poles and zeros against numpy.roots', () => {
  const sections: Sos[] = exampleSpecs.flatMap((e) => {
    const q = planDesign(requireValidSpec(e.spec)).analysis.quantization.filter!;
    return q.sections.flatMap((s) => [s.reference, s.quantized]);
  });

  it.each(sections.map((s, i) => [i, s] as const))('section %i: roots of A(z) and B(z) (a first-order section drops its padding)', (_i, s) => {
    const firstOrder = s.a[2] === 0 && s.b[2] === 0;
    const [poles, zeros] = numpyRoots(firstOrder ? [[1, s.a[1]], [s.b[0], s.b[1]]] : [[...s.a], [...s.b]]);
    const ours = sectionPolesZeros(s);
    expectRoots(ours.poles, poles!);
    expectRoots(ours.zeros, zeros!);
  });

  it('finds a double real pole and complex zeros on the unit circle', () => {
    // (z − 0.9)² = z² − 1.8z + 0.81; zeros z² + 1 → ±j (hand-made, common practice, no source).
    const pz = sectionPolesZeros({ b: [1, 0, 1], a: [1, -1.8, 0.81] });
    expect(pz.poles.map((p) => p.re)).toEqual([0.9, 0.9].map((v) => expect.closeTo(v, 7)));
    expect(sorted(pz.zeros).map((z) => [z.re, z.im])).toEqual([[0, -1], [0, 1]]);
  });
});

describe('error transfer', () => {
  it.each(exampleSpecs.map((e) => [e.id, e.spec] as const))('%s: |E| and |H| satisfy E = 1 − H on the Bode grid', (_id, spec) => {
    const b = planDesign(requireValidSpec(spec)).analysis.bode;
    // |1 − H| from |H| alone is not determined, so check the pair through L: H = L/(1+L), E = 1/(1+L) ⇒ |H|/|E| = |L|.
    for (let i = 0; i < b.freqHz.length; i += 37) {
      expect(b.discreteClosedLoopDb[i]! - b.discreteErrorDb[i]!).toBeCloseTo(b.discreteMagnitudeDb[i]!, 6);
      expect(b.analogClosedLoopDb[i]! - b.analogErrorDb[i]!).toBeCloseTo(b.analogMagnitudeDb[i]!, 6);
    }
  });
});
