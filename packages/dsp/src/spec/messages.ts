/**
 * Wording of validation messages where zod's default would read oddly to a person: a missing field is
 * "missing (expected a number)", not "expected number, received undefined". Passed per parse
 * (`safeParse(input, { error: plainMessages })`), so nothing global changes; every other issue keeps
 * zod's own message.
 */
import type { z } from 'zod';

const ARTICLE: Readonly<Record<string, string>> = { object: 'an object', array: 'an array', number: 'a number', string: 'a string', boolean: 'true or false', int: 'a whole number' };

export const plainMessages: z.core.$ZodErrorMap = (issue) => {
  if (issue.code === 'invalid_type' && issue.input === undefined) return `missing (expected ${ARTICLE[issue.expected] ?? issue.expected})`;
  return undefined;
};
