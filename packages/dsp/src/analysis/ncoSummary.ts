/** The NCO figures of a spec, composed from the nco module (the NCO runs at sampleRateHz, DESIGN.md). */
import type { LoopSpec } from '../spec/schema.ts';
import type { NcoControlScaling, NcoSpectralEstimates, NcoTuning } from '../types/nco.ts';
import { FieldError } from '../fixed/fieldError.ts';
import { ncoTuning } from '../nco/tuningWord.ts';
import { ncoSpectralEstimates } from '../nco/spectralEstimates.ts';
import { specControlScaling } from '../nco/controlScaling.ts';

/** The NCO at the loop rate: tuning word (TRG71), spur/SNR estimates (NS87, Be48), control scaling. */
export interface NcoSummary {
  readonly tuning: NcoTuning;
  readonly spectral: NcoSpectralEstimates;
  /** Control word to tuning increment; null with controlError when the widths cannot represent it. */
  readonly control: NcoControlScaling | null;
  readonly controlError: { readonly field: string; readonly message: string } | null;
}

/** The fixed-point module's NCO figures for the spec (the NCO runs at sampleRateHz, DESIGN.md). */
export function ncoSummary(spec: LoopSpec): NcoSummary {
  const { nco } = spec;
  const tuning = ncoTuning(spec.centerHz, spec.sampleRateHz, nco.accumulatorBits);
  const spectral = ncoSpectralEstimates(nco.accumulatorBits, nco.phaseBits, nco.amplitudeBits);
  try {
    const control = specControlScaling(spec);
    return { tuning, spectral, control, controlError: null };
  } catch (err) {
    if (!(err instanceof FieldError)) throw err;
    return { tuning, spectral, control: null, controlError: { field: err.field, message: err.message } };
  }
}

