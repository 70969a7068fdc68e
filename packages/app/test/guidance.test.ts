import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import { mainsSyncSpec, phaseMarginFromDampingDeg } from '@loopwright/dsp';
import SpecForm from '../src/components/SpecForm.vue';
import { GUIDANCE, NO_SOURCE, guidanceFor, sourceLine } from '../src/form/guidance.ts';
import { SPEC_SECTIONS, testIdFor } from '../src/form/specFields.ts';
import { specToDraft } from '../src/form/specDraft.ts';

const REFERENCES = readFileSync(path.resolve(import.meta.dirname, '../../../docs/REFERENCES.md'), 'utf8');
const bibliography = new Set([...REFERENCES.matchAll(/^\| ([A-Za-z0-9]+) \|/gm)].map((m) => m[1]!).filter((k) => k !== 'key'));
const formPaths = new Set(SPEC_SECTIONS.flatMap((s) => s.fields.map((f) => f.path)));

describe('guidance beside the spec form', () => {
  it('covers every choice the issue names: prewarp, bandwidth, loop rate, damping, widths, rounding, overflow, PI', () => {
    for (const p of ['discretization.prewarp', 'discretization.prewarpHz', 'filter.naturalHz', 'filter.cutoffHz', 'sampleRateHz', 'filter.damping',
      'fixedPoint.coefficientBits', 'fixedPoint.dataBits', 'fixedPoint.rounding', 'fixedPoint.overflow', 'filter.kind']) {
      expect(guidanceFor(p), p).not.toBeNull();
    }
  });

  it('sits on fields the form has, each with a source in docs/REFERENCES.md or marked common practice', () => {
    expect(bibliography.has('G3')).toBe(true);
    for (const [p, g] of Object.entries(GUIDANCE)) {
      expect(formPaths.has(p), p).toBe(true);
      expect(g.sources.length, p).toBeGreaterThan(0);
      for (const source of g.sources) {
        if (source === NO_SOURCE) continue;
        expect(bibliography.has(source.split(' ')[0]!), `${p}: ${source}`).toBe(true);
      }
    }
    expect(sourceLine(GUIDANCE['fixedPoint.overflow']!)).toBe('common practice, no source');
    expect(sourceLine(GUIDANCE['filter.damping']!)).toBe('Source: Og5; G3 Ch. 2');
  });

  it('quotes phase margins per damping that the second-order formula gives (Og5)', () => {
    const text = `${GUIDANCE['filter.damping']!.summary} ${GUIDANCE['filter.damping']!.detail}`;
    const quoted = [...text.matchAll(/ζ = ([0-9.]+) (?:gives )?about ([0-9.]+)°/g)].map((m) => [Number(m[1]), Number(m[2])] as const);
    expect(quoted.length).toBeGreaterThanOrEqual(3);
    for (const [zeta, pm] of quoted) {
      // Og5's closed form, written out here apart from the product's copy: atan(2ζ/√(√(1+4ζ⁴) − 2ζ²)).
      const formula = (Math.atan((2 * zeta) / Math.sqrt(Math.sqrt(1 + 4 * zeta ** 4) - 2 * zeta ** 2)) * 180) / Math.PI;
      expect(Number(formula.toFixed(1)), `ζ = ${zeta}`).toBe(pm);
      expect(Number(phaseMarginFromDampingDeg(zeta).toFixed(1))).toBe(pm);
    }
  });

  it("quotes the NCO's phase lag at fs/10 and fs/4 as the discrete accumulator has it", () => {
    // T·z⁻¹/(1 − z⁻¹) at z = e^{jωT} against the analog integrator's −90° (README conventions).
    const lagDeg = (fOverFs: number) => {
      const w = 2 * Math.PI * fOverFs;
      const re = Math.cos(w) - 1; // denominator z − 1 (the z⁻¹ of the numerator cancels its z)
      const im = Math.sin(w);
      const phase = (-Math.atan2(im, re) * 180) / Math.PI;
      return -90 - phase;
    };
    const text = GUIDANCE['sampleRateHz']!.detail;
    expect(text).toMatch(/18° at a crossover of fs\/10/);
    expect(text).toMatch(/45° at fs\/4/);
    expect(lagDeg(0.1)).toBeCloseTo(18, 9);
    expect(lagDeg(0.25)).toBeCloseTo(45, 9);
  });

  it('says the bilinear frequency shift is under 1 % below fs/20, and it is (OS3 Sec. 7.2: Ω = (2/T)·tan(ωT/2))', () => {
    expect(GUIDANCE['discretization.prewarp']!.detail).toMatch(/Below fs\/20 the shift is under 1 %/);
    const shift = (fOverFs: number) => Math.tan(Math.PI * fOverFs) / (Math.PI * fOverFs) - 1;
    expect(shift(1 / 20)).toBeLessThan(0.01);
    expect(shift(1 / 10)).toBeGreaterThan(0.01);
  });

  it('says about 6 dB per bit, which is 20·log10(2) (Be48)', () => {
    expect(GUIDANCE['fixedPoint.dataBits']!.summary).toMatch(/about 6 dB/);
    expect(20 * Math.log10(2)).toBeCloseTo(6.02, 2);
  });

  it('opens one field’s guidance with its Why? button, and all of them with the switch, even on a read-only form', async () => {
    const wrapper = mount(SpecForm, { props: { draft: specToDraft(mainsSyncSpec), errors: {}, readonly: true } });
    expect(wrapper.findAll('.guide')).toHaveLength(0);
    await wrapper.find(`[data-test="why-${testIdFor('filter.damping')}"]`).trigger('click');
    const guide = wrapper.find(`[data-test="guide-${testIdFor('filter.damping')}"]`);
    expect(guide.text()).toContain('ζ = 0.707 about 65.5°');
    expect(guide.text()).toContain('Source: Og5');
    await wrapper.find(`[data-test="why-${testIdFor('filter.damping')}"]`).trigger('click');
    expect(wrapper.findAll('.guide')).toHaveLength(0);

    await wrapper.find('[data-test="guidance-all"]').trigger('click');
    const visibleGuided = Object.keys(GUIDANCE).filter((p) => wrapper.find(`[data-test="why-${testIdFor(p)}"]`).exists());
    expect(visibleGuided.length).toBeGreaterThan(8);
    expect(wrapper.findAll('.guide')).toHaveLength(visibleGuided.length);
  });
});
