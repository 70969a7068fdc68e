/** Number formatting for reports: engineering prefixes for Hz, fixed decimals for dB and degrees. */

// SI prefixes (SI9, Table 7); femto and atto keep tiny errors off "0.00004 nHz".
const PREFIXES: readonly [number, string][] = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
  [1e-18, 'a'],
];

export function fmtEng(value: number | null | undefined, unit: string, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`;
  const abs = Math.abs(value);
  const [scale, prefix] = PREFIXES.find(([s]) => abs >= s) ?? PREFIXES[PREFIXES.length - 1]!;
  return `${Number((value / scale).toPrecision(digits))} ${prefix}${unit}`;
}

/**
 * An axis tick in SI form ("20 µs", "80 kHz"): charts label their axes with this, so no axis reads
 * "0.0000300" or "80000". A tick that is float noise around zero reads 0.
 */
export function siTick(unit: string, digits = 3): (value: number) => string {
  return (value: number) => (Math.abs(value) < 1e-21 ? `0 ${unit}`.trim() : fmtEng(value, unit, digits).trim());
}

export const fmtHz = (value: number | null | undefined, digits = 4): string => fmtEng(value, 'Hz', digits);

export function fmtFixed(value: number | null | undefined, decimals: number, unit = ''): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return `${value.toFixed(decimals)}${unit ? ` ${unit}` : ''}`;
}

export function fmtSig(value: number | null | undefined, digits = 6): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return String(Number(value.toPrecision(digits)));
}
