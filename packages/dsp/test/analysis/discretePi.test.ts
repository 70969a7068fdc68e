/**
 * Cross-check of the bilinear PI design with the discrete PI loop designed directly in z (R09 App. C
 * (memory)): with θn = B_L·T/(ζ + 1/(4ζ)) and the loop gain K = Kd·Ko, the proportional and integral
 * gains of F(z) = Kp + Ki/(1 − z⁻¹) are
 *   K·T·Kp = 4ζθn/(1 + 2ζθn + θn²),   K·T·Ki = 4θn²/(1 + 2ζθn + θn²).
 * The two designs agree to first order in θn (both approach the analog loop as ωn·T → 0).
 */
import { describe, expect, it } from 'vitest';
import { designLoopFilter } from '../../src/design.ts';
import { loopGain } from '../../src/analysis/loopGain.ts';
import { highGainNoiseBandwidthHz } from '../../src/analysis/noiseBandwidth.ts';
import { mainsSyncSpec } from '../../src/spec/examples.ts';
import type { LoopSpec } from '../../src/spec/schema.ts';

describe('bilinear PI against the discrete-time PI design (R09 App. C (memory))', () => {
  it.each([
    [0.5, 0.5],
    [2, 0.707],
    [20, 1],
  ])('natural frequency %f Hz, ζ = %f at 10 kHz', (naturalHz, damping) => {
    const spec: LoopSpec = { ...mainsSyncSpec, rippleFilter: null, filter: { kind: 'pi', naturalHz, damping } };
    const sec = designLoopFilter(spec).sections[0]!;
    // F(z) = (b0 + b1·z⁻¹)/(1 − z⁻¹) = Kp + Ki/(1 − z⁻¹) with Kp = −b1, Ki = b0 + b1.
    expect(sec.a).toEqual([1, -1, 0]);
    const kp = -sec.b[1];
    const ki = sec.b[0] + sec.b[1];
    const k = loopGain(spec).kRadPerS;
    const t = 1 / spec.sampleRateHz;
    const bl = highGainNoiseBandwidthHz(2 * Math.PI * naturalHz, damping); // exact for PI (G3)
    const theta = (bl * t) / (damping + 1 / (4 * damping));
    const d = 1 + 2 * damping * theta + theta * theta;
    const tol = 4 * theta; // first-order agreement
    expect(Math.abs((k * t * kp) / ((4 * damping * theta) / d) - 1)).toBeLessThan(tol);
    expect(Math.abs((k * t * ki) / ((4 * theta * theta) / d) - 1)).toBeLessThan(tol);
  });
});
