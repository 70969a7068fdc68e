/**
 * One analyzeDesign call of a demo example in a fresh process (bench/analysis.ts runs this a few
 * times per example), as the editor's worker makes it. Prints one JSON line: the wall-clock ms of
 * importing the module graph (planDesign and the examples, zod with them; under tsx, so its
 * transform cache counts too) and of that first call, cold JIT and all, each also in process CPU ms
 * (all threads: the JIT's background compiles count; other processes' load does not). Both are
 * reported, so work moved from the call into module evaluation shows up instead of disappearing.
 */
export {};

const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const c0 = cpuMs();
const t0 = performance.now();
const { analyzeDesign } = await import('../src/planDesign.ts');
const { exampleSpecs } = await import('../src/spec/examples.ts');
const t1 = performance.now();
const c1 = cpuMs();

const example = exampleSpecs.find((e) => e.id === process.argv[2]);
if (!example) throw new Error(`unknown example '${process.argv[2] ?? ''}'`);
const c2 = cpuMs();
const t2 = performance.now();
analyzeDesign(example.spec);
const t3 = performance.now();
const c3 = cpuMs();
process.stdout.write(`${JSON.stringify({ importMs: t1 - t0, firstCallMs: t3 - t2, importCpuMs: c1 - c0, firstCallCpuMs: c3 - c2 })}\n`);
