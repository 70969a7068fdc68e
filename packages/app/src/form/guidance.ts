/**
 * Guidance beside the spec form's choices: for each field where the designer decides something, a
 * line saying what the choice trades, and its source — a key of docs/REFERENCES.md with the chapter
 * or section, or "common practice, no source". Our own words throughout; figures quoted here are
 * checked against packages/dsp in test/guidance.test.ts.
 */

export const NO_SOURCE = 'common practice, no source';

export interface Guidance {
  /** One sentence, shown under the field on request. */
  readonly summary: string;
  /** A few more sentences: what each way of choosing costs and buys. */
  readonly detail: string;
  /** Bibliography keys with a section ("G3 Ch. 2"), or NO_SOURCE. */
  readonly sources: readonly string[];
}

const PREWARP: Guidance = {
  summary: 'Makes the digital response equal the analog one exactly at one frequency.',
  detail:
    'The bilinear transform squeezes the whole analog frequency axis into 0 … fs/2, so every feature of the response moves down in frequency, more the closer it sits to fs/2. ' +
    'Prewarping removes that shift at the frequency you name: use the one that matters most, usually the loop crossover (or the ripple filter cut-off when it sits near fs/2). ' +
    'Below fs/20 the shift is under 1 %, and prewarping changes little.',
  sources: ['OS3 Sec. 7.2', 'PM4 Sec. 10.3'],
};

const LOOP_BANDWIDTH: Guidance = {
  summary: 'A wider loop tracks faster; a narrower one lets less noise and ripple through.',
  detail:
    'Raising the natural frequency (or cut-off) shortens lock time, shrinks the phase error left by a frequency step or FM, and widens the lock-in range (about 2ζωn). ' +
    'It also widens the noise bandwidth B_L, so more of the input noise reaches the phase error and the NCO, and it leaves less attenuation for the 2·f ripple of a multiplier detector. ' +
    'Choose the narrowest loop that still follows how fast your input frequency moves.',
  sources: ['G3', 'B6'],
};

const LOOP_RATE: Guidance = {
  summary: 'Keep the loop crossover at a tenth of this rate or lower.',
  detail:
    'In discrete time the NCO is an accumulator with one sample of delay; against the analog integrator it lags by 180°·f/fs, which is 18° at a crossover of fs/10 and 45° at fs/4. ' +
    'That lag comes straight off the phase margin, so the analog prototype’s margins hold only when the crossover is a small fraction of the loop rate. ' +
    'A faster loop rate costs fabric clock cycles per update; the editor shows both the analog and the discrete margins so the loss is visible.',
  sources: [NO_SOURCE],
};

const DAMPING: Guidance = {
  summary: 'Sets the phase margin: ζ = 0.5 gives about 51.8°, ζ = 0.707 about 65.5°.',
  detail:
    'A phase margin of roughly 45° to 65° is the usual range. Below it the closed loop peaks above 0 dB near the crossover (noise there is amplified, not just passed) and a step overshoots and rings longer; ' +
    'above about 70° the loop gets sluggish for its bandwidth. For the second-order loop ζ = 0.35 gives about 38.3°, ζ = 0.5 about 51.8° and ζ = 0.707 about 65.5°.',
  sources: ['Og5', 'G3 Ch. 2'],
};

const FILTER_KIND: Guidance = {
  summary: 'Choose PI (type 2) when a frequency offset or ramp must leave no steady phase error.',
  detail:
    'A type-1 loop (single pole, lag-lead, Butterworth) holds a constant frequency offset Δω only with a steady phase error Δω/(K·F(0)), and cannot follow a frequency ramp at all. ' +
    'A PI filter adds an integrator: the offset leaves no phase error and a ramp leaves a constant one. ' +
    'Use PI when the input sits away from the centre frequency or drifts (mains frequency, Doppler, a crystal warming up) and the phase must be exact; a type-1 loop is simpler and has no integrator to saturate.',
  sources: ['G3 Ch. 2', 'B6'],
};

const RIPPLE: Guidance = {
  summary: 'Adds attenuation of the 2·f term a multiplier detector produces, at the cost of phase near crossover.',
  detail:
    'A multiplier detector’s output carries a term at twice the carrier frequency; what the loop filter lets through modulates the NCO. ' +
    'A Butterworth low-pass in series lowers it further but adds phase lag: put its cut-off several times above the loop crossover and well below 2·centre frequency, and check the margins afterwards.',
  sources: [NO_SOURCE],
};

const COEFFICIENT_BITS: Guidance = {
  summary: 'More coefficient bits keep the poles where they were designed; each bit widens every multiplier.',
  detail:
    'A narrow loop puts its filter poles close to z = 1, where the values a fixed-point section can represent are sparse, so quantising the coefficients moves the pole radius (shown in the Quantisation tab). ' +
    'The narrower the loop relative to the loop rate, the more bits it needs. Each bit adds to every multiplier’s width; the Word length tab finds the cheapest width that still meets the margins.',
  sources: ['OS3 Sec. 6.8'],
};

const FRACTION_BITS: Guidance = {
  summary: '"auto" uses the most fraction bits that still hold the largest coefficient.',
  detail:
    'Fraction bits set the step between representable coefficients; integer bits set the largest one. "auto" gives every spare bit to the fraction. ' +
    'Fix the number only to match an existing datapath.',
  sources: [NO_SOURCE],
};

const DATA_BITS: Guidance = {
  summary: 'Each data bit lowers the roundoff noise floor by about 6 dB.',
  detail:
    'Every rounding point in the filter adds noise of one LSB’s size; the Quantisation tab gives its gain to the output and the phase jitter it causes. ' +
    'Wider data costs registers and wider multipliers and adders; narrower data raises the noise floor and the phase jitter.',
  sources: ['Be48', 'OS3 Sec. 6.8'],
};

const ACCUMULATOR_BITS: Guidance = {
  summary: 'Guard bits above the product width keep sums inside the multiply-accumulate from overflowing.',
  detail:
    'Products of data and coefficients are summed before rounding; each extra bit doubles the headroom of that sum. Too few and the section overflows on a large transient; more than needed costs only adder width.',
  sources: [NO_SOURCE],
};

const ROUNDING: Guidance = {
  summary: 'Truncation is free but biased by half an LSB; rounding costs an adder per rounding point.',
  detail:
    'Truncation (dropping the low bits, toward −∞) needs no logic but shifts every result down by half an LSB on average; in a loop with an integrator that bias becomes a steady phase offset or a slow drift. ' +
    'Round half away from zero adds one adder per rounding point; its only bias is on exact ties, which it pushes away from zero. Half-even (convergent) sends ties to the even neighbour, so even that averages out, for a little more logic.',
  sources: ['IEEE754 cl. 4.3 (the names of the modes)', NO_SOURCE],
};

const OVERFLOW: Guidance = {
  summary: 'Saturate keeps the loop in control through a transient; wrap is free but flips sign on overflow.',
  detail:
    'Saturation clamps a result at the largest value, at the cost of a comparison and a multiplexer per point. ' +
    'Wrapping lets two’s-complement arithmetic roll over: it needs no logic and is right where rollover is intended (the NCO phase accumulator), ' +
    'but in the loop filter a wrap turns a large positive value into a large negative one and can throw the loop out of lock.',
  sources: [NO_SOURCE],
};

const NCO_ACCUMULATOR: Guidance = {
  summary: 'Sets the frequency resolution: loop rate / 2^bits.',
  detail: 'More bits give a finer tuning word and a smaller error of the centre frequency; each costs one adder and register bit.',
  sources: ['TRG71'],
};

const NCO_PHASE_BITS: Guidance = {
  summary: 'Each address bit of the sine table lowers the phase-truncation spur by about 6 dB.',
  detail: 'The table has 2^bits entries, so each bit doubles its memory; the NCO tab shows the spur estimate for the tuning word.',
  sources: ['NS87', 'TW05'],
};

const NCO_AMPLITUDE_BITS: Guidance = {
  summary: 'Each output bit raises the NCO’s signal-to-quantisation-noise ratio by about 6 dB.',
  detail: 'A full-scale sine of B bits has an SNR of about 6.02·B + 1.76 dB; each bit widens the table words and the detector multiplier.',
  sources: ['Be48'],
};

/** Guidance per spec path (the form's field paths, specFields.ts). */
export const GUIDANCE: Readonly<Record<string, Guidance>> = {
  sampleRateHz: LOOP_RATE,
  'nco.accumulatorBits': NCO_ACCUMULATOR,
  'nco.phaseBits': NCO_PHASE_BITS,
  'nco.amplitudeBits': NCO_AMPLITUDE_BITS,
  'filter.kind': FILTER_KIND,
  'filter.naturalHz': LOOP_BANDWIDTH,
  'filter.cutoffHz': LOOP_BANDWIDTH,
  'filter.damping': DAMPING,
  'rippleFilter.enabled': RIPPLE,
  'discretization.prewarp': PREWARP,
  'discretization.prewarpHz': PREWARP,
  'fixedPoint.coefficientBits': COEFFICIENT_BITS,
  'fixedPoint.coefficientFractionBits': FRACTION_BITS,
  'fixedPoint.dataBits': DATA_BITS,
  'fixedPoint.accumulatorBits': ACCUMULATOR_BITS,
  'fixedPoint.rounding': ROUNDING,
  'fixedPoint.overflow': OVERFLOW,
};

export function guidanceFor(path: string): Guidance | null {
  return GUIDANCE[path] ?? null;
}

/** "Source: G3 Ch. 2; B6" — or, for a fact of the trade, "common practice, no source". */
export function sourceLine(g: Guidance): string {
  return g.sources.length === 1 && g.sources[0] === NO_SOURCE ? NO_SOURCE : `Source: ${g.sources.join('; ')}`;
}
