/**
 * designLoopFilter: the spec's loop filter as analog prototype, digital b/a and second-order sections.
 * A thin composition of the pipeline steps (analog sections → bilinear per section → cascade), in the
 * manner of SciPy's filter design; firmware implements (and quantises) the sections, not the b/a.
 */
import type { AnalogTf, DigitalTf, Sos } from './types/filter.ts';
import type { LoopSpec } from './spec/schema.ts';
import { analogLoopFilter } from './filters/loopFilter.ts';
import { bilinearSection } from './filters/bilinear.ts';
import { cascadeAnalog, sosToTf } from './filters/sections.ts';
import { loopGain } from './analysis/loopGain.ts';
import { secondOrderParameters } from './analysis/secondOrder.ts';

export interface LoopFilterDesign {
  /** Full analog F(s) (loop filter × ripple filter). */
  readonly analog: AnalogTf;
  /** Analog sections of order ≤ 2, loop filter first. */
  readonly analogSections: readonly AnalogTf[];
  /** Full digital F(z), b/a in powers of z⁻¹ with a[0] = 1. */
  readonly digital: DigitalTf;
  /** Digital second-order sections, one per analog section (bilinear per section). */
  readonly sections: readonly Sos[];
  /** Number of leading sections that form the loop filter proper (the rest: ripple filter). */
  readonly loopFilterSectionCount: number;
  readonly tau?: { readonly tauS?: number; readonly tau1S?: number; readonly tau2S?: number };
  /** Integrators in F (1 for PI); loop type = integrators + 1. */
  readonly integrators: number;
  /** Natural frequency and damping of the second-order loop (without the ripple filter), when they apply. */
  readonly naturalHz?: number;
  readonly damping?: number;
}

/** Design the spec's loop filter. Expects a spec that passed parseLoopSpec. */
export function designLoopFilter(spec: LoopSpec): LoopFilterDesign {
  const a = analogLoopFilter(spec);
  const { sampleRateHz } = spec;
  const { prewarpHz } = spec.discretization;
  const sections = a.sections.map((s) => bilinearSection(s, sampleRateHz, prewarpHz));
  const so = secondOrderParameters(spec, loopGain(spec).kRadPerS, a.tau);
  return {
    analog: cascadeAnalog(a.sections),
    analogSections: a.sections,
    digital: sosToTf(sections),
    sections,
    loopFilterSectionCount: a.loopFilterSectionCount,
    ...(a.tau ? { tau: a.tau } : {}),
    integrators: a.integrators,
    ...(so ? { naturalHz: so.naturalHz, damping: so.damping } : {}),
  };
}
