import { parseLoopSpec, type LoopSpec, type SpecIssue, type SpecWarning } from '@loopwright/dsp';
import { draftToSpec, type SpecDraft } from './specDraft.ts';
import { fieldMessage, labelOf } from '../lib/messages.ts';

export interface DraftCheck {
  /** The validated spec, or null while any field is wrong. */
  readonly spec: LoopSpec | null;
  /** Message per field path; "" holds issues of the document as a whole. */
  readonly errors: Readonly<Record<string, string>>;
  readonly warnings: readonly SpecWarning[];
  readonly issueCount: number;
}

// The schema's "path: " prefix gives way to the field's label, in a sentence with the bound's unit.
function sentenceOf(issue: SpecIssue): string {
  return fieldMessage(issue.field, issue.message);
}

/** One object for "no errors", so the form's props stay the same from one valid keystroke to the next. */
const NO_ERRORS: Readonly<Record<string, string>> = Object.freeze({});

/** Validate the draft with the shared zod schema (parseLoopSpec) and spread issues over the fields. */
export function checkDraft(draft: Readonly<SpecDraft>): DraftCheck {
  const result = parseLoopSpec(draftToSpec(draft));
  if (result.ok) return { spec: result.spec, errors: NO_ERRORS, warnings: result.warnings, issueCount: 0 };
  const errors: Record<string, string> = {};
  for (const issue of result.issues) {
    const field = issue.field === 'filter' ? 'filter.kind' : issue.field;
    errors[field] = errors[field] ? `${errors[field]} ${sentenceOf(issue)}` : sentenceOf(issue);
  }
  return { spec: null, errors, warnings: [], issueCount: result.issues.length };
}

/** Messages for paths no visible field shows, so nothing the schema says gets lost. */
export function unplacedErrors(errors: Readonly<Record<string, string>>, visiblePaths: ReadonlySet<string>): string[] {
  return Object.entries(errors)
    .filter(([path]) => !visiblePaths.has(path))
    .map(([path, message]) => (path ? (message.startsWith(labelOf(path).label) ? message : fieldMessage(path, message)) : message));
}
