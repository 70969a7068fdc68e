/**
 * Natural frequency and damping of the second-order loops, L(s) = K·F(s)/s (G3 Ch. 2; B6 tables):
 * - single-pole F = 1/(1+sτ):            ωn = √(K/τ),        ζ = 1/(2√(Kτ))        (type 1)
 * - lag-lead F = (1+sτ2)/(1+s(τ1+τ2)):   ωn = √(K/(τ1+τ2)),  ζ = (ωn/2)(τ2 + 1/K)  (type 1)
 * - PI F = (1+sτ2)/(sτ1):                ωn = √(K/τ1),       ζ = ωn·τ2/2           (type 2)
 * A first-order Butterworth is a single pole at τ = 1/ωc. Higher-order Butterworth loop filters give a
 * loop of order > 2, where ωn and ζ do not apply. A ripple filter in series is ignored here (the
 * figures then describe the dominant second-order part only).
 */
import type { LoopSpec } from '../spec/schema.ts';

export interface SecondOrderParameters {
  readonly naturalHz: number;
  readonly damping: number;
  readonly wnRadPerS: number;
}

/** ωn (rad/s and Hz) and ζ of the second-order loop, or null when the loop is not second order. */
export function secondOrderParameters(
  spec: LoopSpec,
  kRadPerS: number,
  tau: { readonly tauS?: number; readonly tau1S?: number; readonly tau2S?: number } | undefined,
): SecondOrderParameters | null {
  const f = spec.filter;
  const k = kRadPerS;
  let wn: number;
  let zeta: number;
  if (f.kind === 'single-pole' || (f.kind === 'butterworth' && f.order === 1)) {
    const t = f.kind === 'single-pole' ? (tau?.tauS ?? 1 / (2 * Math.PI * f.cutoffHz)) : 1 / (2 * Math.PI * f.cutoffHz);
    wn = Math.sqrt(k / t);
    zeta = 1 / (2 * Math.sqrt(k * t));
  } else if (f.kind === 'lag-lead' && tau?.tau1S !== undefined && tau.tau2S !== undefined) {
    wn = Math.sqrt(k / (tau.tau1S + tau.tau2S));
    zeta = (wn / 2) * (tau.tau2S + 1 / k);
  } else if (f.kind === 'pi' && tau?.tau1S !== undefined && tau.tau2S !== undefined) {
    wn = Math.sqrt(k / tau.tau1S);
    zeta = (wn * tau.tau2S) / 2;
  } else {
    return null;
  }
  return { naturalHz: wn / (2 * Math.PI), damping: zeta, wnRadPerS: wn };
}

/**
 * Phase margin of the standard second-order loop as a function of ζ (Og5 Sec. 7-6 (memory)):
 *   PM = atan(2ζ / √(√(1 + 4ζ⁴) − 2ζ²)).
 * The same value holds for the PI loop (2ζωn·s + ωn²)/s²: there PM = atan(2ζ·ωc/ωn) with
 * ωc² = ωn²(2ζ² + √(4ζ⁴+1)), which is algebraically identical.
 */
export function phaseMarginFromDampingDeg(damping: number): number {
  const z2 = damping * damping;
  return (Math.atan((2 * damping) / Math.sqrt(Math.sqrt(1 + 4 * z2 * z2) - 2 * z2)) * 180) / Math.PI;
}
