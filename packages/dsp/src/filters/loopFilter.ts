/**
 * Analog loop filters F(s) from the spec, as cascaded sections of order ≤ 2 (loop filter first,
 * then the optional ripple filter in series). Conventions of DESIGN.md:
 * - single-pole: F = 1/(1 + sτ), τ = 1/(2π·cutoffHz);
 * - lag-lead:    F = (1 + sτ2)/(1 + s(τ1 + τ2));
 * - pi:          F = (1 + sτ2)/(sτ1)  (type-2 loop);
 * - butterworth: unit-DC-gain low-pass of order 1–4 at cutoffHz (poles on the circle of radius ωc);
 * - rippleFilter: a Butterworth low-pass in series.
 * Second-order loop relations (ωn, ζ) are G3 Ch. 2 and B6; see timeConstants.ts.
 */
import type { AnalogTf } from '../types/filter.ts';
import type { LoopSpec } from '../spec/schema.ts';
import { loopGain } from '../analysis/loopGain.ts';
import { analogButterworthSections } from './butterworth.ts';
import { lagLeadFromTargets, piFromTargets, type TimeConstants } from './timeConstants.ts';

export interface AnalogLoopFilter {
  /** Loop filter sections followed by ripple filter sections. */
  readonly sections: readonly AnalogTf[];
  /** How many of `sections` belong to the loop filter proper (the rest are the ripple filter). */
  readonly loopFilterSectionCount: number;
  /** τ of the single-pole filter, or τ1/τ2 of lag-lead and PI (designed from targets when given). */
  readonly tau?: { readonly tauS?: number; readonly tau1S?: number; readonly tau2S?: number };
  /** Number of integrators in F(s) (1 for PI); the loop type is this plus one for the NCO. */
  readonly integrators: number;
}

/** Time constants of a lag-lead or PI filter, designed from targets when the spec gives targets. */
export function secondOrderTimeConstants(spec: LoopSpec): TimeConstants | null {
  const f = spec.filter;
  if (f.kind !== 'lag-lead' && f.kind !== 'pi') return null;
  if (f.tau1S !== undefined && f.tau2S !== undefined) return { tau1S: f.tau1S, tau2S: f.tau2S };
  if (f.naturalHz === undefined || f.damping === undefined) return null; // excluded by the schema
  const k = loopGain(spec).kRadPerS;
  if (f.kind === 'pi') return piFromTargets(k, f.naturalHz, f.damping);
  const r = lagLeadFromTargets(k, f.naturalHz, f.damping);
  return r.ok ? r.tau : null; // unreachable targets are rejected by the schema
}

/**
 * The loop filter's sections followed by the ripple filter's. A function of the module, not a closure
 * bound to a name per call: under tsx (the server, the bench), which keeps names, each such closure has
 * its name defined when it is made (Object.defineProperty, about 0.4 µs); the same holds for the other
 * helpers of the analysis made module functions beside this one.
 */
function withRipple(loop: AnalogTf[], ripple: readonly AnalogTf[], rest: Omit<AnalogLoopFilter, 'sections' | 'loopFilterSectionCount'>): AnalogLoopFilter {
  return { sections: [...loop, ...ripple], loopFilterSectionCount: loop.length, ...rest };
}

/** Analog F(s) of the spec as sections. Expects a spec that passed parseLoopSpec. */
export function analogLoopFilter(spec: LoopSpec): AnalogLoopFilter {
  const ripple = spec.rippleFilter ? analogButterworthSections(spec.rippleFilter.order, spec.rippleFilter.cutoffHz) : [];
  const f = spec.filter;
  switch (f.kind) {
    case 'single-pole': {
      const tauS = 1 / (2 * Math.PI * f.cutoffHz);
      return withRipple([{ num: [1], den: [tauS, 1] }], ripple, { tau: { tauS }, integrators: 0 });
    }
    case 'butterworth':
      return withRipple(analogButterworthSections(f.order, f.cutoffHz), ripple, { integrators: 0 });
    case 'lag-lead':
    case 'pi': {
      const tc = secondOrderTimeConstants(spec);
      if (!tc) throw new RangeError(`filter: ${f.kind} needs tau1S/tau2S or reachable naturalHz/damping`);
      const { tau1S, tau2S } = tc;
      const section: AnalogTf =
        f.kind === 'pi' ? { num: [tau2S, 1], den: [tau1S, 0] } : { num: [tau2S, 1], den: [tau1S + tau2S, 1] };
      return withRipple([section], ripple, { tau: { tau1S, tau2S }, integrators: f.kind === 'pi' ? 1 : 0 });
    }
  }
}
