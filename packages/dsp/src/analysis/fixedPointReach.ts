/**
 * How far the fixed-point loop can move its NCO, and so the largest offset it can hold. The bit-true
 * NCO runs at (M + Δ(y))·fs/2^N with Δ proportional to the filter output y (TRG71; nco/controlScaling.ts),
 * and y cannot pass the datapath's limit (datapath.ts: the D-bit full scale, or less when the MAC word
 * is narrow), so the NCO reaches at most ±controlRangeHz = limit·gainHzPerUnit from its centre.
 * Locked at an offset Δf, a loop needs y = Δf/gainHzPerUnit in steady state, and every section output
 * before it the same DC divided by the DC gain of the sections after it. On top of that DC each section
 * output carries the detector's 2·centerHz ripple, amplitude Kd·|F_1…k| there (multiplier identity,
 * ripple.ts), and the section saturates (or wraps) when DC + ripple passes the limit. So the NCO's
 * reach is gainHzPerUnit·min_k (limit − ripple_k)·DC gain after k — for the mains demo the PI section's
 * own ripple takes a third of the range before the ripple filter removes it. Then:
 *   - type 2 (PI): the ideal hold-in K·F(0) is infinite (G3 Ch. 2), the fixed-point one is that reach;
 *   - type 1: the detector saturates first at K·F(0) (G3 Ch. 2), unless the reach is smaller.
 * Estimates and scenarios beyond that reach are warned about, naming the field that sets it and the
 * field that asks for more.
 */
import type { Scenario } from '../spec/scenario.ts';
import type { SpecWarning } from '../spec/schema.ts';
import type { AcquisitionEstimates } from '../types/analysis.ts';
import type { Sos } from '../types/filter.ts';
import type { DatapathFigures } from './datapath.ts';
import { digitalResponse } from './response.ts';
import { integratorCount } from './discreteLoop.ts';

export interface FixedPointReach {
  /** Largest offset from the tuned centre the locked loop's NCO can be held at: within datapath.controlRangeHz, less the ripple's headroom. */
  readonly reachHz: number;
  /** The section whose output limits the reach first (0-based, the cascade's order), or null when none limits it. */
  readonly limitingSection: number | null;
  /** Lowest and highest NCO frequency the locked fixed-point loop reaches: the tuned centre ∓ reachHz. */
  readonly lowestHz: number;
  readonly highestHz: number;
  /** Largest offset the fixed-point loop can hold: min(K·F(0), control range); the control range for type 2. */
  readonly holdInHz: number;
  /** What sets holdInHz: the NCO's control range, or the loop gain K·F(0) (type 1, inside the range). */
  readonly limitedBy: 'control-range' | 'loop-gain';
  /** The spec field that sets the control range: the NCO gain, or the MAC width when the MAC clamps the output first. */
  readonly rangeField: 'nco.gainHzPerUnit' | 'fixedPoint.accumulatorBits';
  readonly notes: readonly string[];
}

const fmtHz = (hz: number) => `${Number(hz.toPrecision(4))} Hz`;

export interface ReachInputs {
  readonly spec: { readonly sampleRateHz: number; readonly centerHz: number; readonly nco: { readonly gainHzPerUnit: number } };
  /** The designed sections in cascade order, and the detector gain Kd (control units per radian). */
  readonly sections: readonly Sos[];
  readonly kd: number;
  readonly datapath: DatapathFigures | null;
  readonly tunedCenterHz: number;
  readonly estimates: AcquisitionEstimates;
}

/** min_k (limit − ripple_k)·DC gain after k, in control units, and the section that sets it. */
function rippleLimitedUnits(r: ReachInputs, limit: number): { readonly units: number; readonly section: number | null } {
  const { sections, kd, spec } = r;
  let best = { units: limit, section: null as number | null };
  for (let k = 0; k < sections.length; k++) {
    const upTo = sections.slice(0, k + 1);
    const h = digitalResponse(upTo, 2 * spec.centerHz, spec.sampleRateHz);
    const ripple = kd * Math.hypot(h.re, h.im);
    const after = sections.slice(k + 1);
    // DC gain of the sections after k: infinite when one integrates (the DC then needs no room here).
    const dcAfter = integratorCount(after) > 0 ? Infinity : after.reduce((g, s) => (g * (s.b[0] + s.b[1] + s.b[2])) / (s.a[0] + s.a[1] + s.a[2]), 1);
    const room = Math.max(0, limit - ripple);
    const units = room === 0 ? 0 : room * Math.abs(dcAfter);
    if (units < best.units) best = { units, section: k };
  }
  return best;
}

/** The reach of the fixed-point loop; null when quantisation failed (no datapath, analysis says why). */
export function fixedPointReach(r: ReachInputs): FixedPointReach | null {
  const { spec, datapath, tunedCenterHz, estimates } = r;
  if (!datapath) return null;
  const limited = rippleLimitedUnits(r, datapath.outputLimitUnits);
  const rangeHz = limited.units * spec.nco.gainHzPerUnit;
  const rangeField = datapath.macLimitsOutput ? 'fixedPoint.accumulatorBits' : 'nco.gainHzPerUnit';
  const gainHold = estimates.holdInHz;
  const limitedBy = gainHold !== null && gainHold <= rangeHz ? 'loop-gain' : 'control-range';
  const holdInHz = limitedBy === 'loop-gain' ? (gainHold as number) : rangeHz;
  const notes: string[] = [];
  if (limitedBy === 'control-range') {
    const ripple =
      limited.section === null
        ? ''
        : `, less the headroom the 2·centerHz ripple needs at the output of section ${limited.section + 1}`;
    notes.push(
      `the control word moves the NCO at most ±${fmtHz(datapath.controlRangeHz)} (${Number(datapath.outputLimitUnits.toPrecision(6))} unit × ${spec.nco.gainHzPerUnit} Hz/unit, ${rangeField})${ripple}: a locked loop holds its NCO within ±${fmtHz(rangeHz)} of the centre; ` +
        (gainHold === null
          ? 'the ideal PI loop would hold any offset, the fixed-point loop holds only this'
          : `less than the hold-in K·F(0) = ${fmtHz(gainHold)} of the loop gain, so the fixed-point loop holds only this`),
    );
  }
  return {
    reachHz: rangeHz,
    limitingSection: limited.section,
    lowestHz: tunedCenterHz - rangeHz,
    highestHz: tunedCenterHz + rangeHz,
    holdInHz,
    limitedBy,
    rangeField,
    notes,
  };
}

/** Warnings for acquisition estimates the fixed-point loop cannot reach (named by the field that sets the reach). */
export function reachWarnings(reach: FixedPointReach | null, estimates: AcquisitionEstimates): SpecWarning[] {
  if (!reach) return [];
  const out: SpecWarning[] = [];
  if (reach.limitedBy === 'control-range' && estimates.holdInHz !== null) warnBeyond(reach, 'hold-in', estimates.holdInHz, out);
  warnBeyond(reach, 'lock-in', estimates.lockInHz, out);
  warnBeyond(reach, 'pull-out', estimates.pullOutHz, out);
  return out;
}

/** The warning for an estimate beyond the reach (pushed to out); a module function, not a named closure per call (filters/loopFilter.ts, withRipple). */
function warnBeyond(reach: FixedPointReach, what: string, hz: number | null, out: SpecWarning[]): void {
  if (hz === null || hz <= reach.holdInHz * (1 + 1e-9)) return;
  out.push({
    field: reach.rangeField,
    message: `the ${what} estimate ${fmtHz(hz)} is beyond the ±${fmtHz(reach.holdInHz)} the fixed-point loop can hold (${reach.limitedBy === 'control-range' ? 'its NCO control range' : 'K·F(0)'}); the bit-true loop cannot lock or stay locked that far out`,
  });
}

/** The largest offset a scenario asks the loop to follow, and the scenario field that sets it (null: none, a phase step). */
function scenarioOffset(s: Scenario): { readonly hz: number; readonly field: string } | null {
  switch (s.kind) {
    case 'tone':
      return { hz: Math.abs(s.offsetHz), field: 'offsetHz' };
    case 'frequency-step':
      return { hz: Math.abs(s.stepHz), field: 'stepHz' };
    case 'phase-step':
      return null;
    case 'fm':
      return { hz: Math.abs(s.deviationHz), field: 'deviationHz' };
    case 'sweep':
      return Math.abs(s.toHz) >= Math.abs(s.fromHz) ? { hz: Math.abs(s.toHz), field: 'toHz' } : { hz: Math.abs(s.fromHz), field: 'fromHz' };
  }
}

/** A warning when the scenario asks for more offset than the fixed-point loop can hold, naming the scenario's field. */
export function scenarioReachWarning(reach: FixedPointReach | null, scenario: Scenario): SpecWarning | null {
  const off = scenarioOffset(scenario);
  if (!reach || !off || off.hz <= reach.holdInHz) return null;
  const why =
    reach.limitedBy === 'control-range'
      ? `the NCO control range, set by ${reach.rangeField}`
      : 'the hold-in range K·F(0)';
  return {
    field: off.field,
    message: `${off.field} ${fmtHz(off.hz)} is beyond the ±${fmtHz(reach.holdInHz)} the fixed-point loop can hold (${why}); expect the bit-true loop to slip cycles and not lock`,
  };
}
