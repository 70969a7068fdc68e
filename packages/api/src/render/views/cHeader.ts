/** View-model of templates/c-header.h.hbs: macros typed by <stdint.h> constant macros. */
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText } from '../identifiers.ts';
import { cLiteral, cType } from '../literals.ts';
import type { ArtifactHeader } from './header.ts';
import { groupLines } from './tables.ts';

export interface CHeaderView {
  readonly header: ArtifactHeader;
  readonly guard: string;
  readonly counts: readonly { name: string; value: string; comment: string }[];
  readonly codes: readonly { name: string; literal: string; comment: string }[];
  readonly types: readonly { name: string; type: string; comment: string }[];
  readonly tables: readonly { name: string; type: string; length: string; comment: string; lines: { text: string }[] }[];
}

export function cHeaderView(model: HandoffModel, header: ArtifactHeader): CHeaderView {
  const names = codeNames(model.name);
  return {
    header,
    guard: names.constant('H_INCLUDED'),
    counts: model.counts.map((c) => ({
      name: names.constant(c.suffix),
      value: c.value < 0 ? `(${c.value})` : String(c.value),
      comment: commentText(c.meaning),
    })),
    codes: model.codes.map((c) => ({
      name: names.constant(c.suffix),
      literal: cLiteral(c.code, c.signedness, c.widthBits),
      comment: commentText(`${cType(c.signedness, c.widthBits)}, ${c.widthBits} bits: ${c.meaning}`),
    })),
    types: model.types.map((t) => ({
      name: names.typeName(t.suffix),
      type: cType(t.signedness, t.widthBits),
      comment: commentText(t.meaning),
    })),
    // Table codes are below 2^31 in magnitude: plain int constants, converted exactly to the element type.
    tables: model.tables.map((t) => ({
      name: names.constant(t.suffix),
      type: cType(t.signedness, t.widthBits),
      length: String(t.codes.length),
      comment: commentText(t.meaning),
      lines: groupLines(t.codes.map(String), 12, ',', ','),
    })),
  };
}
