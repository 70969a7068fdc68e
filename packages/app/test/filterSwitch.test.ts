/**
 * Switching the filter kind or "set by" fills the new fields from the design on screen. Expected
 * values worked by hand from the second-order formulas (G3 Ch. 2; B6 loop-filter tables), for the
 * mains demo: K = Kd·Ko = 0.5 · 2π·20 Hz/unit = 62.832 1/s (Kd = A_in·A_nco/2 with A_in = 1; its NCO
 * gain 20 Hz/unit), ωn = 2π·5 Hz = 31.416 rad/s, ζ = 0.707.
 */
import { describe, expect, it } from 'vitest';
import { loopGain, mainsSyncSpec } from '@loopwright/dsp';
import { filterSwitchEdits } from '../src/form/filterSwitch.ts';
import { specToDraft } from '../src/form/specDraft.ts';
import { checkDraft } from '../src/form/specValidation.ts';

const close = (text: string | undefined, want: number, rel = 1e-4) => expect(Math.abs(Number(text) / want - 1)).toBeLessThan(rel);

describe('filter kind and "set by" switches', () => {
  const draft = specToDraft(mainsSyncSpec);
  const K = 0.5 * 2 * Math.PI * 20;
  const wn = 2 * Math.PI * 5;

  it('uses the loop gain the worked example assumes', () => {
    expect(mainsSyncSpec.filter).toMatchObject({ kind: 'pi', naturalHz: 5, damping: 0.707 });
    expect(loopGain(mainsSyncSpec).kRadPerS).toBeCloseTo(K, 6);
  });

  it('converts natural frequency and damping into τ1 = K/ωn², τ2 = 2ζ/ωn and back', () => {
    const edits = filterSwitchEdits(mainsSyncSpec, draft, 'filter.mode', 'time-constants');
    close(edits['filter.tau1S'], K / wn ** 2); // 0.063662 s
    close(edits['filter.tau2S'], (2 * 0.707) / wn); // 0.045009 s
    const byTau = { ...draft, 'filter.mode': 'time-constants', ...edits };
    const check = checkDraft(byTau);
    expect(check.errors).toEqual({});
    const back = filterSwitchEdits(check.spec, byTau, 'filter.mode', 'targets');
    close(back['filter.naturalHz'], 5);
    close(back['filter.damping'], 0.707);
  });

  it('fills a lag-lead from the same loop: τ1 + τ2 = K/ωn², τ2 = 2ζ/ωn − 1/K', () => {
    const byTau = { ...draft, 'filter.mode': 'time-constants' };
    const edits = filterSwitchEdits(mainsSyncSpec, byTau, 'filter.kind', 'lag-lead');
    const tau2 = (2 * 0.707) / wn - 1 / K;
    close(edits['filter.tau2S'], tau2);
    close(edits['filter.tau1S'], K / wn ** 2 - tau2);
    expect(checkDraft({ ...byTau, 'filter.kind': 'lag-lead', ...edits }).errors).toEqual({});
  });

  it('fills a single-pole cut-off ωn²/(2πK) and leaves no field empty', () => {
    const edits = filterSwitchEdits(mainsSyncSpec, draft, 'filter.kind', 'single-pole');
    close(edits['filter.cutoffHz'], wn ** 2 / (2 * Math.PI * K)); // 2.5 Hz
    const check = checkDraft({ ...draft, 'filter.kind': 'single-pole', ...edits });
    expect(check.errors).toEqual({});
    expect(JSON.stringify(check)).not.toMatch(/undefined/);
  });

  it('changes nothing for other fields', () => {
    expect(filterSwitchEdits(mainsSyncSpec, draft, 'clockHz', '1')).toEqual({});
  });
});
