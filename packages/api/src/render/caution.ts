/**
 * The Safety cautions of DESIGN.md, stated once: README.txt of every bundle and the `caution` field of
 * every release JSON carry this text. Plain ASCII so it can sit in any generated comment.
 */
export const CAUTION_LINES: readonly string[] = [
  'A release is a design aid, not a certified design.',
  'Verify these numbers in simulation and on the bench before they drive hardware.',
  "Follow your organisation's review rules before putting a release into a product.",
  'Where the loop controls power electronics, follow the applicable codes and licensed engineering practice.',
];

export const CAUTION = CAUTION_LINES.join(' ');

/** One short line for the banner of generated code. */
export const CAUTION_SHORT = 'Design aid: verify in simulation and on the bench before use; see README.txt.';
