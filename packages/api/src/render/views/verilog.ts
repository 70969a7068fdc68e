/** View-model of templates/verilog-include.vh.hbs: localparams to `include inside a module body. */
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText } from '../identifiers.ts';
import { verilogLiteral, verilogType } from '../literals.ts';
import type { ArtifactHeader } from './header.ts';

export interface VerilogView {
  readonly header: ArtifactHeader;
  readonly counts: readonly { name: string; value: string; comment: string }[];
  readonly codes: readonly { name: string; type: string; literal: string; comment: string }[];
  readonly tables: readonly { name: string; type: string; addressRange: string; zero: string; comment: string; lines: { text: string }[] }[];
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
    // A function with a case statement: a ROM every Verilog tool infers, no array parameters needed.
    tables: model.tables.map((t) => {
      const name = names.constant(t.suffix);
      const addressBits = Math.max(1, Math.ceil(Math.log2(t.codes.length)));
      return {
        name,
        type: verilogType(t.signedness, t.widthBits),
        addressRange: `[${addressBits - 1}:0]`,
        zero: verilogLiteral(0n, t.signedness, t.widthBits),
        comment: commentText(t.meaning),
        lines: t.codes.map((c, k) => ({ text: `${addressBits}'d${k}: ${name} = ${verilogLiteral(BigInt(c), t.signedness, t.widthBits)};` })),
      };
    }),
  };
}
