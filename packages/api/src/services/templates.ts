import { exampleSpecs, ultrasonicSinglePoleSpec, type LoopSpec } from '@loopwright/dsp';
import type { TemplateRecord } from '@loopwright/contract';

/** Design templates are the dsp package's example specs (the demo scenario of DESIGN.md). */
export function listTemplates(): TemplateRecord[] {
  return exampleSpecs.map((example) => ({ id: example.id, title: example.title, description: example.description, spec: example.spec }));
}

export function findTemplate(id: string): LoopSpec | undefined {
  return exampleSpecs.find((example) => example.id === id)?.spec;
}

/** A spec `name` (an HDL/C identifier, [a-z][a-z0-9_]{0,39}) derived from a free-text title. */
export function identifierFromTitle(title: string): string {
  const slug = title.toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_+|_+$/g, '');
  const start = /^[a-z]/.test(slug) ? slug : `loop_${slug}`;
  return start.slice(0, 40).replace(/_+$/, '') || 'loop';
}

/**
 * A blank design starts from the simplest loop there is, the single-pole (type-1) example, renamed
 * after the design; every field is then the designer's to change.
 */
export function blankSpec(title: string): LoopSpec {
  return { ...ultrasonicSinglePoleSpec, name: identifierFromTitle(title) };
}
