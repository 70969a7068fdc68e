/** The PARAMS text that bench/loop.c reads for a bit-true plan (field order documented in loop.c). */
import type { BitTruePlan } from '../src/types/sim.ts';

const ROUNDING = { truncate: 0, nearest: 1, 'half-even': 2 } as const;

export function formatCParams(plan: BitTruePlan): string {
  const header = [
    plan.ncoAccumulatorBits,
    plan.phaseBits,
    plan.amplitudeBits,
    plan.dataBits,
    plan.coefficientBits,
    plan.coefficientFractionBits,
    plan.accumulatorBits,
    ROUNDING[plan.rounding],
    plan.overflow === 'wrap' ? 1 : 0,
    plan.waveform === 'square' ? 1 : 0,
    plan.sectionCount,
    plan.tuning.tuningWordHi,
    plan.tuning.tuningWordLo,
    plan.control.gainCode,
    plan.control.gainShift,
    plan.ncoFullScale,
  ];
  return `${header.join(' ')}\n${plan.coefficientCodes.join(' ')}\n${Array.from(plan.sineTable).join(' ')}\n`;
}
