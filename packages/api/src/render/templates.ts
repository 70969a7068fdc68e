/**
 * Handlebars templates of the release artifacts, read from the repository's `templates/` folder.
 *
 * Templates hold no logic: only `{{value}}` and `{{#each list}}`; every number arrives already
 * formatted by the template's typed view-model. Compiled with `strict` (a missing field is an error,
 * never an empty string) and `noEscape` (HTML escaping would corrupt code; the view-models pass only
 * literals and identifiers they built themselves).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import Handlebars from 'handlebars';

export const TEMPLATE_DIR = fileURLToPath(new URL('../../../../templates/', import.meta.url));

export const TEMPLATE_FILES = {
  vhdl: 'vhdl-package.vhd.hbs',
  verilog: 'verilog-include.vh.hbs',
  cHeader: 'c-header.h.hbs',
  readme: 'readme.txt.hbs',
  'vhdl.round': 'rtl-round.vhd.hbs',
  'vhdl.nco': 'rtl-nco.vhd.hbs',
  'vhdl.detector': 'rtl-detector.vhd.hbs',
  'vhdl.section': 'rtl-section.vhd.hbs',
  'vhdl.loop': 'rtl-loop.vhd.hbs',
  'vhdl.testbench': 'rtl-testbench.vhd.hbs',
  'verilog.round': 'rtl-round.v.hbs',
  'verilog.nco': 'rtl-nco.v.hbs',
  'verilog.detector': 'rtl-detector.v.hbs',
  'verilog.section': 'rtl-section.v.hbs',
  'verilog.loop': 'rtl-loop.v.hbs',
  'verilog.testbench': 'rtl-testbench.v.hbs',
} as const;

export type TemplateId = keyof typeof TEMPLATE_FILES;

const handlebars = Handlebars.create();
const compiled = new Map<TemplateId, Handlebars.TemplateDelegate>();

export function templateSource(id: TemplateId): string {
  return readFileSync(TEMPLATE_DIR + TEMPLATE_FILES[id], 'utf8');
}

/** Renders one template with its view-model (the type is checked at the caller's view module). */
export function renderTemplate(id: TemplateId, view: object): string {
  let template = compiled.get(id);
  if (!template) {
    template = handlebars.compile(templateSource(id), { strict: true, noEscape: true });
    compiled.set(id, template);
  }
  return template(view);
}
