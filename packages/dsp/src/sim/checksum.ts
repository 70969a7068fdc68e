/**
 * Checksum of a bit-true record: FNV-1a (Fowler–Noll–Vo, 32-bit offset basis 2166136261, prime
 * 16777619; memory) applied to whole 32-bit words instead of bytes — h = (h XOR w)·16777619 mod 2^32 —
 * over each sample's words in the order inputCode, phaseHi, phaseLo, tableAddress, ncoCode,
 * detectorCode, filterCode (signed codes as their two's-complement 32-bit pattern). bench/loop.c
 * computes the same.
 */
import type { BitTrueRecord } from '../types/sim.ts';

export const CHECKSUM_BASIS = 2166136261;
const PRIME = 16777619;

/** Continue checksum `h` over samples [0, count) of the arrays. */
export function checksumRecord(h: number, r: Omit<BitTrueRecord, 'length'>, count: number): number {
  let x = h | 0;
  for (let i = 0; i < count; i++) {
    x = Math.imul(x ^ (r.inputCode[i] as number), PRIME);
    x = Math.imul(x ^ (r.phaseHi[i] as number), PRIME);
    x = Math.imul(x ^ (r.phaseLo[i] as number), PRIME);
    x = Math.imul(x ^ (r.tableAddress[i] as number), PRIME);
    x = Math.imul(x ^ (r.ncoCode[i] as number), PRIME);
    x = Math.imul(x ^ (r.detectorCode[i] as number), PRIME);
    x = Math.imul(x ^ (r.filterCode[i] as number), PRIME);
  }
  return x >>> 0;
}
