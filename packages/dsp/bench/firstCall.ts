/**
 * One analyzeDesign call of a demo example in a fresh process (bench/analysis.ts runs this a few
 * times per example), as the editor's worker makes it. Prints one JSON line: the wall-clock ms of
 * importing the module graph (planDesign and the examples, zod with them; under tsx, so its
 * transform cache counts too) and of that first call, cold JIT and all. Both are reported, so work
 * moved from the call into module evaluation shows up instead of disappearing.
 */
export {};

const t0 = performance.now();
const { analyzeDesign } = await import('../src/planDesign.ts');
const { exampleSpecs } = await import('../src/spec/examples.ts');
const t1 = performance.now();

const example = exampleSpecs.find((e) => e.id === process.argv[2]);
if (!example) throw new Error(`unknown example '${process.argv[2] ?? ''}'`);
const t2 = performance.now();
analyzeDesign(example.spec);
const t3 = performance.now();
process.stdout.write(`${JSON.stringify({ importMs: t1 - t0, firstCallMs: t3 - t2 })}\n`);
