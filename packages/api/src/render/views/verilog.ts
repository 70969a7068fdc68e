/** View-model of templates/verilog-include.vh.hbs: localparams to `include inside a module body. */
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText } from '../identifiers.ts';
import { verilogLiteral, verilogType } from '../literals.ts';
import type { ArtifactHeader } from './header.ts';

export interface VerilogView {
  readonly header: ArtifactHeader;
  readonly counts: readonly { name: string; value: string; comment: string }[];
  readonly codes: readonly { name: string; type: string; literal: string; comment: string }[];
}

export function verilogView(model: HandoffModel, header: ArtifactHeader): VerilogView {
  const names = codeNames(model.name);
  return {
    header,
    counts: model.counts.map((c) => ({
      name: names.constant(c.suffix),
      value: String(c.value),
      comment: commentText(c.meaning),
    })),
    codes: model.codes.map((c) => ({
      name: names.constant(c.suffix),
      type: verilogType(c.signedness, c.widthBits),
      literal: verilogLiteral(c.code, c.signedness, c.widthBits),
      comment: commentText(c.meaning),
    })),
  };
}
