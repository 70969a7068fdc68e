/**
 * Time constants of the second-order loop filters from loop targets (natural frequency, damping).
 *
 * Loop L(s) = K·F(s)/s with K = Kd·Ko (G3 Ch. 2; B6 loop-filter tables):
 * - PI, F = (1+sτ2)/(sτ1): ωn = √(K/τ1), ζ = ωn·τ2/2  ⇒  τ1 = K/ωn², τ2 = 2ζ/ωn.
 * - lag-lead, F = (1+sτ2)/(1+s(τ1+τ2)): ωn = √(K/(τ1+τ2)), ζ = (ωn/2)(τ2 + 1/K)
 *   ⇒  τ1 + τ2 = K/ωn², τ2 = 2ζ/ωn − 1/K, τ1 = K/ωn² − τ2.
 *   Reachable only when τ2 > 0 (2ζK > ωn: the loop gain must exceed the damping the bare
 *   pole already gives) and τ1 > 0.
 */

export interface TimeConstants {
  readonly tau1S: number;
  readonly tau2S: number;
}

export type TargetResult =
  | { readonly ok: true; readonly tau: TimeConstants }
  | { readonly ok: false; readonly field: 'naturalHz' | 'damping'; readonly message: string };

/** PI time constants from ωn and ζ (G3 Ch. 2, B6). Always reachable for positive inputs. */
export function piFromTargets(kRadPerS: number, naturalHz: number, damping: number): TimeConstants {
  const wn = 2 * Math.PI * naturalHz;
  return { tau1S: kRadPerS / (wn * wn), tau2S: (2 * damping) / wn };
}

/** Lag-lead time constants from ωn and ζ (G3 Ch. 2, B6), or the field that makes them unreachable. */
export function lagLeadFromTargets(kRadPerS: number, naturalHz: number, damping: number): TargetResult {
  const wn = 2 * Math.PI * naturalHz;
  const sum = kRadPerS / (wn * wn);
  const tau2S = (2 * damping) / wn - 1 / kRadPerS;
  if (!(tau2S > 0)) {
    const minDamping = wn / (2 * kRadPerS);
    return {
      ok: false,
      field: 'damping',
      message:
        `lag-lead cannot reach damping ${damping} at ${naturalHz} Hz with loop gain K = ${fmt(kRadPerS)} 1/s: ` +
        `τ2 = 2ζ/ωn − 1/K = ${fmt(tau2S)} s is not positive; damping must exceed ωn/(2K) = ${fmt(minDamping)} ` +
        `(or raise nco.gainHzPerUnit / lower naturalHz)`,
    };
  }
  const tau1S = sum - tau2S;
  if (!(tau1S > 0)) {
    return {
      ok: false,
      field: 'naturalHz',
      message:
        `lag-lead cannot reach ${naturalHz} Hz with damping ${damping} and loop gain K = ${fmt(kRadPerS)} 1/s: ` +
        `τ1 = K/ωn² − τ2 = ${fmt(tau1S)} s is not positive; lower naturalHz or damping, or raise the loop gain`,
    };
  }
  return { ok: true, tau: { tau1S, tau2S } };
}

function fmt(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(4) : String(x);
}
