/**
 * One analyzeDesign call of a demo example in a fresh process (bench/analysis.ts runs this once per
 * example): the wall-clock ms of that first call, cold JIT and all, on stdout.
 */
import { analyzeDesign } from '../src/planDesign.ts';
import { exampleSpecs } from '../src/spec/examples.ts';

const example = exampleSpecs.find((e) => e.id === process.argv[2]);
if (!example) throw new Error(`unknown example '${process.argv[2] ?? ''}'`);
const t0 = performance.now();
analyzeDesign(example.spec);
process.stdout.write(`${performance.now() - t0}\n`);
