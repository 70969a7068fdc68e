/**
 * The invented story the demo releases tell (DESIGN.md, "Demo scenario"): per demo project, the
 * designer edits the seeded design five times and cuts a release of each revision; what then happens
 * to each release (approved and used by firmware, changes requested, withdrawn, waiting for review,
 * left as a draft) is data here, played through the real API by demoReleases.ts.
 */
import type { LoopSpec } from '@loopwright/dsp';

/** What happens to a release after it is cut. */
export type DemoFate =
  | { readonly kind: 'approved' }
  | { readonly kind: 'changes-requested'; readonly comment: string }
  | { readonly kind: 'withdrawn'; readonly reason: string }
  | { readonly kind: 'in-review' }
  | { readonly kind: 'draft' };

export interface DemoRevision {
  /** One line on what the designer changed, for the log. */
  readonly change: string;
  readonly edit: (base: LoopSpec) => LoopSpec;
  readonly fate: DemoFate;
}

export interface DemoStory {
  /** The seeded design this story edits (seed.ts, DEMO_PROJECTS). */
  readonly designName: string;
  /** In cut order: v1, v2, … */
  readonly revisions: readonly DemoRevision[];
}

const same = (base: LoopSpec): LoopSpec => base;
const widths = (fixedPoint: Partial<LoopSpec['fixedPoint']>) => (base: LoopSpec): LoopSpec => ({ ...base, fixedPoint: { ...base.fixedPoint, ...fixedPoint } });

/**
 * v1 is the approved release (cut first, so its RTL is verified first and the seed waits least);
 * the later revisions are the designer's follow-up work on the same design.
 */
export const DEMO_STORIES: readonly DemoStory[] = [
  {
    designName: 'Mains sync PI loop',
    revisions: [
      { change: 'the seeded spec', edit: same, fate: { kind: 'approved' } },
      {
        change: 'coefficients narrowed to 16 bits',
        edit: widths({ coefficientBits: 16 }),
        fate: { kind: 'changes-requested', comment: 'The 16-bit coefficients save a DSP column but move the ripple filter poles; compare the quantised margins with v1 and keep 18 bits unless the fabric really needs it.' },
      },
      {
        change: 'natural frequency raised to 8 Hz',
        edit: (b) => ({ ...b, filter: { kind: 'pi', naturalHz: 8, damping: 0.707 } }),
        fate: { kind: 'withdrawn', reason: 'Cut from the wrong revision: the 8 Hz loop was a bench experiment for faster resynchronisation after a grid fault, not meant for review.' },
      },
      { change: 'natural frequency 6 Hz, damping 0.8', edit: (b) => ({ ...b, filter: { kind: 'pi', naturalHz: 6, damping: 0.8 } }), fate: { kind: 'in-review' } },
      {
        change: 'ripple filter cutoff lowered to 30 Hz',
        edit: (b) => ({ ...b, filter: { kind: 'pi', naturalHz: 6, damping: 0.8 }, rippleFilter: { order: 2, cutoffHz: 30 } }),
        fate: { kind: 'draft' },
      },
    ],
  },
  {
    designName: 'Carrier tracker',
    revisions: [
      { change: 'the seeded spec', edit: same, fate: { kind: 'approved' } },
      {
        change: 'data path narrowed to 14 bits',
        edit: widths({ dataBits: 14 }),
        fate: { kind: 'changes-requested', comment: 'At 14 data bits the detector output loses 12 dB of headroom; the ADC front end gives 16 bits, so keep the data path at 16.' },
      },
      {
        change: 'loop filter cutoff raised to 2.4 kHz',
        edit: (b) => ({ ...b, filter: { kind: 'single-pole', cutoffHz: 2400 } }),
        fate: { kind: 'withdrawn', reason: 'The wider loop follows the transducer’s ring-down but lets through more of the 80 kHz ripple; withdrawn before review, superseded by the 1.8 kHz revision.' },
      },
      { change: 'loop filter cutoff 1.8 kHz', edit: (b) => ({ ...b, filter: { kind: 'single-pole', cutoffHz: 1800 } }), fate: { kind: 'in-review' } },
      {
        change: 'second-order ripple filter at 8 kHz added',
        edit: (b) => ({ ...b, filter: { kind: 'single-pole', cutoffHz: 1800 }, rippleFilter: { order: 2, cutoffHz: 8000 } }),
        fate: { kind: 'draft' },
      },
    ],
  },
  {
    designName: 'FM demodulator loop',
    revisions: [
      { change: 'the seeded spec', edit: same, fate: { kind: 'approved' } },
      {
        change: 'coefficients narrowed to 16 bits',
        edit: widths({ coefficientBits: 16 }),
        fate: { kind: 'changes-requested', comment: 'Please show the quantised Bode plot next to v1 before we go to 16-bit coefficients; the audio distortion budget was set with 18.' },
      },
      {
        change: 'loop bandwidth raised to 1.2 MHz',
        edit: (b) => ({ ...b, filter: { kind: 'butterworth', order: 2, cutoffHz: 1.2e6 }, discretization: { method: 'bilinear', prewarpHz: 1.2e6 } }),
        fate: { kind: 'withdrawn', reason: 'The channel plan changed back to 200 kHz deviation, so the 1.2 MHz loop is not needed; withdrawn.' },
      },
      {
        change: 'loop bandwidth 900 kHz',
        edit: (b) => ({ ...b, filter: { kind: 'butterworth', order: 2, cutoffHz: 900e3 }, discretization: { method: 'bilinear', prewarpHz: 900e3 } }),
        fate: { kind: 'in-review' },
      },
      {
        change: 'NCO amplitude widened to 14 bits',
        edit: (b) => ({ ...b, filter: { kind: 'butterworth', order: 2, cutoffHz: 900e3 }, discretization: { method: 'bilinear', prewarpHz: 900e3 }, nco: { ...b.nco, amplitudeBits: 14 } }),
        fate: { kind: 'draft' },
      },
    ],
  },
];

/** The capture names firmware uploads for each approved release. */
export const DEMO_CAPTURES = {
  bitExact: 'fpga_capture.csv',
  failing: 'fpga_capture_truncating.csv',
} as const;

/**
 * The failing capture: the golden vectors with the loop filter's output code one LSB low on
 * FAILING_RUN samples from FAILING_FROM_SAMPLE, as a filter that truncates instead of rounding on
 * a run of samples would give (common practice, no source: the usual first bug of a fixed-point port).
 */
export const FAILING_FROM_SAMPLE = 2000;
export const FAILING_RUN = 6;
