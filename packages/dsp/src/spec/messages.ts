/**
 * Wording of validation messages in plain words where zod's default would read oddly to a person: a
 * missing field is "missing (expected a number)", not "expected number, received undefined"; a bound
 * is "must be at least 2", not "Too small: expected number to be >=2". Passed per parse
 * (`safeParse(input, PARSE_CONTEXT)`, below), so nothing global changes. The field's label and unit
 * are the reader's to add (the app names the field it shows the message under, the API the path).
 */
import type { z } from 'zod';

const ARTICLE: Readonly<Record<string, string>> = { object: 'an object', array: 'an array', number: 'a number', string: 'text', boolean: 'true or false', int: 'a whole number' };

function bound(origin: string, word: 'least' | 'most', value: unknown, inclusive: boolean | undefined): string | undefined {
  const n = typeof value === 'bigint' ? value.toString() : String(value);
  if (origin === 'number' || origin === 'int' || origin === 'bigint') {
    if (inclusive === false) return `must be ${word === 'least' ? 'above' : 'below'} ${n}`;
    return `must be at ${word} ${n}`;
  }
  if (origin === 'string') return `must be at ${word} ${n} character${n === '1' ? '' : 's'} long`;
  if (origin === 'array' || origin === 'set') return `must hold at ${word} ${n} item${n === '1' ? '' : 's'}`;
  return undefined;
}

export const plainMessages: z.core.$ZodErrorMap = (issue) => {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.input === undefined) return `missing (expected ${ARTICLE[issue.expected] ?? issue.expected})`;
      return `must be ${ARTICLE[issue.expected] ?? issue.expected}`;
    case 'too_small':
      return bound(issue.origin, 'least', issue.minimum, issue.inclusive);
    case 'too_big':
      return bound(issue.origin, 'most', issue.maximum, issue.inclusive);
    case 'not_multiple_of':
      return `must be a multiple of ${String(issue.divisor)}`;
    case 'invalid_value':
      return `must be one of ${issue.values.map((v) => String(v)).join(', ')}`;
    default:
      return undefined;
  }
};

/**
 * How the spec and the scenario are parsed: plain messages, and zod's interpreted object parser
 * (`jitless`) rather than the one it generates with `new Function` for each object schema on first
 * use. These are small documents parsed once per keystroke or request, so generating and compiling
 * that code costs more than it saves: in fresh Node processes the first spec parse took about a third
 * of the CPU time without it, and a warm parse stayed within a few microseconds of the generated one.
 * Only these parses change; the contract's request schemas keep zod's default.
 */
export const PARSE_CONTEXT = { error: plainMessages, jitless: true } as const;
