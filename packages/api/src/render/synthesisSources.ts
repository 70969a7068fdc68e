/**
 * The Verilog a resource estimate synthesises: the include of constants and the RTL modules, rendered
 * exactly as a release renders them (the same views and templates), without the golden vectors,
 * which synthesis does not need. The word-length search estimates candidate widths this way.
 */
import type { BitTrueDesign } from './compute.ts';
import { handoffModel } from './fromDsp.ts';
import { artifactHeaders, artifactNames } from './artifacts.ts';
import { RTL_PARTS, rtlModel } from './rtl.ts';
import { renderTemplate, type TemplateId } from './templates.ts';
import { rtlVerilogView } from './views/rtlVerilog.ts';
import { verilogView } from './views/verilog.ts';
import type { VerilogSources } from '../rtl/estimate.ts';

export function synthesisSources(design: BitTrueDesign): VerilogSources {
  const { spec } = design;
  const names = artifactNames(spec.name);
  const header = artifactHeaders(spec);
  const rtl = rtlModel(spec.name, design.bitTrue);
  const files = new Map<string, string>([[names.verilog, renderTemplate('verilog', verilogView(handoffModel(design), header(names.verilog)))]]);
  const verilogFiles = { include: names.verilog, parts: names.rtl.verilog, testbench: names.rtl.verilogTestbench };
  for (const p of RTL_PARTS) {
    const name = names.rtl.verilog[p];
    files.set(name, renderTemplate(`verilog.${p}` as TemplateId, rtlVerilogView(rtl, header(name), verilogFiles)));
  }
  return { files, modules: RTL_PARTS.map((p) => names.rtl.verilog[p]), top: rtl.entities.loop };
}
