/**
 * Switching the filter kind or what sets it ("set by") fills the fields it brings up from the design
 * on screen, so the loop stays the same loop in the new terms instead of leaving empty fields.
 *
 * Loop L(s) = K·F(s)/s with K = Kd·Ko (G3 Ch. 2; B6 loop-filter tables):
 * - PI, F = (1+sτ2)/(sτ1): ωn = √(K/τ1), ζ = ωn·τ2/2; lag-lead, F = (1+sτ2)/(1+s(τ1+τ2)):
 *   ωn = √(K/(τ1+τ2)), ζ = (ωn/2)(τ2 + 1/K) (secondOrderParameters, and back: piFromTargets,
 *   lagLeadFromTargets, the same formulas dsp designs with).
 * - single pole, F = 1/(1+sτ): ωn = √(K/τ), so τ = K/ωn² and the cut-off 1/(2πτ) = ωn²/(2πK).
 */
import { loopGain, lagLeadFromTargets, piFromTargets, secondOrderParameters, type LoopSpec } from '@loopwright/dsp';
import type { SpecDraft } from './specDraft.ts';

const text = (x: number): string => String(Number(x.toPrecision(6)));

/** ωn (Hz) and ζ of the spec's loop, when it is second order (single pole, Butterworth 1, PI, lag-lead). */
function targetsOf(spec: LoopSpec, kRadPerS: number): { naturalHz: number; damping: number } | null {
  const f = spec.filter as Record<string, unknown>;
  const tau = typeof f['tau1S'] === 'number' && typeof f['tau2S'] === 'number' ? { tau1S: f['tau1S'] as number, tau2S: f['tau2S'] as number } : undefined;
  if ((spec.filter.kind === 'pi' || spec.filter.kind === 'lag-lead') && typeof f['naturalHz'] === 'number' && typeof f['damping'] === 'number') {
    return { naturalHz: f['naturalHz'] as number, damping: f['damping'] as number };
  }
  const p = secondOrderParameters(spec, kRadPerS, tau);
  return p ? { naturalHz: p.naturalHz, damping: p.damping } : null;
}

/**
 * Draft edits after `path` (filter.kind or filter.mode) changed to `value`: the new fields, converted
 * from `spec`, the design before the switch. Empty when there is no valid design to convert from or
 * the current loop has no second-order equivalent (a Butterworth of order 2 or more).
 */
export function filterSwitchEdits(spec: LoopSpec | null, draft: Readonly<SpecDraft>, path: string, value: string): SpecDraft {
  if (!spec || (path !== 'filter.kind' && path !== 'filter.mode')) return {};
  const next = { ...draft, [path]: value };
  const k = loopGain(spec).kRadPerS;
  const targets = targetsOf(spec, k);
  if (!targets) return {};
  const kind = next['filter.kind'];
  if (kind === 'single-pole' || kind === 'butterworth') {
    const wn = 2 * Math.PI * targets.naturalHz;
    const edits: SpecDraft = { 'filter.cutoffHz': text((wn * wn) / (2 * Math.PI * k)) };
    if (kind === 'butterworth') edits['filter.order'] = '1';
    return edits;
  }
  if (kind !== 'pi' && kind !== 'lag-lead') return {};
  if (next['filter.mode'] === 'targets') return { 'filter.naturalHz': text(targets.naturalHz), 'filter.damping': text(targets.damping) };
  if (kind === 'pi') {
    const tau = piFromTargets(k, targets.naturalHz, targets.damping);
    return { 'filter.tau1S': text(tau.tau1S), 'filter.tau2S': text(tau.tau2S) };
  }
  const r = lagLeadFromTargets(k, targets.naturalHz, targets.damping);
  // An unreachable lag-lead keeps the targets the user can then adjust (the schema names the field).
  if (!r.ok) return { 'filter.mode': 'targets', 'filter.naturalHz': text(targets.naturalHz), 'filter.damping': text(targets.damping) };
  return { 'filter.tau1S': text(r.tau.tau1S), 'filter.tau2S': text(r.tau.tau2S) };
}
