import { expect } from 'vitest';

/**
 * Deep equality where numbers may differ in their last bits. The worker thread runs the dsp code as
 * tsx compiles it and the test as Vite compiles it; floating-point results are not promised to match
 * to the last ulp across two compilations, so 1e-9 relative is the bar (common practice, no source).
 */
export function expectDeepClose(actual: unknown, expected: unknown, relTol = 1e-9, where = '$'): void {
  if (typeof expected === 'number' && typeof actual === 'number') {
    const scale = Math.max(Math.abs(expected), Math.abs(actual), 1e-300);
    expect(Math.abs(actual - expected) / scale, `${where}: ${actual} vs ${expected}`).toBeLessThanOrEqual(relTol);
    return;
  }
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual), `${where} is an array`).toBe(true);
    const list = actual as unknown[];
    expect(list.length, `${where}.length`).toBe(expected.length);
    expected.forEach((item, i) => expectDeepClose(list[i], item, relTol, `${where}[${i}]`));
    return;
  }
  if (expected !== null && typeof expected === 'object') {
    expect(actual !== null && typeof actual === 'object', `${where} is an object`).toBe(true);
    const record = actual as Record<string, unknown>;
    expect(Object.keys(record).sort(), `${where} keys`).toEqual(Object.keys(expected).sort());
    for (const [key, value] of Object.entries(expected)) expectDeepClose(record[key], value, relTol, `${where}.${key}`);
    return;
  }
  expect(actual, where).toEqual(expected);
}
