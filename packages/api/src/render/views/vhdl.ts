/** View-model of templates/vhdl-package.vhd.hbs: a VHDL-2008 package of the design's constants. */
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText, vhdlIdentifier } from '../identifiers.ts';
import { vhdlLiteral, vhdlType } from '../literals.ts';
import type { ArtifactHeader } from './header.ts';
import { groupLines } from './tables.ts';

export interface VhdlView {
  readonly header: ArtifactHeader;
  readonly packageName: string;
  readonly counts: readonly { name: string; type: string; value: string; comment: string }[];
  readonly codes: readonly { name: string; type: string; literal: string; comment: string }[];
  readonly types: readonly { name: string; type: string; comment: string }[];
  readonly tables: readonly { typeName: string; name: string; last: string; elementType: string; comment: string; lines: { text: string }[] }[];
}

export function vhdlView(model: HandoffModel, header: ArtifactHeader): VhdlView {
  const names = codeNames(model.name);
  return {
    header,
    packageName: names.vhdlPackage,
    counts: model.counts.map((c) => ({
      name: names.vhdlConstant(c.suffix),
      type: c.value >= 0 ? 'natural' : 'integer',
      value: String(c.value),
      comment: commentText(c.meaning),
    })),
    codes: model.codes.map((c) => ({
      name: names.vhdlConstant(c.suffix),
      type: vhdlType(c.signedness, c.widthBits),
      literal: vhdlLiteral(c.code, c.signedness, c.widthBits),
      comment: commentText(`${c.code}: ${c.meaning}`),
    })),
    types: model.types.map((t) => ({
      name: vhdlIdentifier(names.typeName(t.suffix)),
      type: vhdlType(t.signedness, t.widthBits),
      comment: commentText(t.meaning),
    })),
    // Table codes are below 2^31 in magnitude, inside VHDL's guaranteed integer range, so to_signed is exact.
    tables: model.tables.map((t) => ({
      typeName: vhdlIdentifier(`${model.name}_${t.suffix.toLowerCase()}_table_t`),
      name: names.vhdlConstant(t.suffix),
      last: String(t.codes.length - 1),
      elementType: vhdlType(t.signedness, t.widthBits),
      comment: commentText(t.meaning),
      lines: groupLines(t.codes.map((c) => `to_signed(${c}, ${t.widthBits})`), 6, ',', ''),
    })),
  };
}
