import { readdirSync } from 'node:fs';
import Handlebars from 'handlebars';
import { describe, expect, it } from 'vitest';
import { TEMPLATE_DIR, TEMPLATE_FILES, templateSource, type TemplateId } from '../../src/render/templates.ts';

type Node = { type: string; path?: { original?: unknown }; program?: { body: Node[] }; inverse?: unknown; params?: unknown[]; hash?: unknown; body?: Node[] };

/** Every mustache and block of a parsed template. */
function statements(nodes: Node[]): Node[] {
  return nodes.flatMap((n) => [n, ...(n.program ? statements(n.program.body) : [])]);
}

describe('templates hold no logic', () => {
  it('lists every template file of templates/', () => {
    expect(readdirSync(TEMPLATE_DIR).filter((f) => f.endsWith('.hbs')).sort()).toEqual(Object.values(TEMPLATE_FILES).sort());
  });

  for (const id of Object.keys(TEMPLATE_FILES) as TemplateId[]) {
    it(`${TEMPLATE_FILES[id]} uses only plain values and #each`, () => {
      const ast = Handlebars.parse(templateSource(id)) as unknown as { body: Node[] };
      for (const s of statements(ast.body)) {
        if (s.type === 'BlockStatement') {
          expect(s.path?.original).toBe('each');
          expect(s.inverse).toBeUndefined();
        }
        if (s.type === 'MustacheStatement') expect(s.params ?? []).toEqual([]);
        expect(['PartialStatement', 'DecoratorBlock', 'PartialBlockStatement']).not.toContain(s.type);
      }
    });
  }
});
