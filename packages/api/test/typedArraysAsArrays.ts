/**
 * JSON.stringify's text of a value with each typed array written as a JSON array of its numbers: the
 * tests' reference for the API's encoder (src/encodedJson.ts jsonText), made another way, with a
 * replacer, which JSON.stringify calls on each value before writing it (ECMA262, JSON.stringify).
 */
export const typedArraysAsArrays = (value: unknown): string =>
  JSON.stringify(value, (_key, v: unknown) => (ArrayBuffer.isView(v) && !(v instanceof DataView) ? Array.from(v as unknown as ArrayLike<number>) : v));
