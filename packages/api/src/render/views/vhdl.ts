/** View-model of templates/vhdl-package.vhd.hbs: a VHDL-2008 package of the design's constants. */
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText, vhdlIdentifier } from '../identifiers.ts';
import { vhdlLiteral, vhdlType } from '../literals.ts';
import type { ArtifactHeader } from './header.ts';

export interface VhdlView {
  readonly header: ArtifactHeader;
  readonly packageName: string;
  readonly counts: readonly { name: string; type: string; value: string; comment: string }[];
  readonly codes: readonly { name: string; type: string; literal: string; comment: string }[];
  readonly types: readonly { name: string; type: string; comment: string }[];
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
      name: vhdlIdentifier(`${model.name}_${t.suffix.toLowerCase()}_t`),
      type: vhdlType(t.signedness, t.widthBits),
      comment: commentText(t.meaning),
    })),
  };
}
