/**
 * Release benchmark (not a timed test): cutting a release of each demo design on a real MariaDB,
 * phase by phase — recompute (analysis, quantisation, NCO), render every artifact, store in one
 * transaction, zip the bundle — against the target of 100 ms of server time excluding what
 * computeRelease adds to the plan (golden vectors, their CSV and hex files, the measured acquisition),
 * which is reported apart; the golden-vector run itself in samples per second of CPU time.
 * Starts its own MariaDB (scripts/lib/mariadb.ts) in .data/bench-release and seeds the demo scenario.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { Writable } from 'node:stream';
import { startMariaDb } from '../../../scripts/lib/mariadb.ts';
import { dbEnv, loadConfig } from '../src/config.ts';
import { createDataSource, runMigrations } from '../src/data-source.ts';
import { Design, User } from '../src/entities/index.ts';
import { loadHandoffConfig } from '../src/mail/config.ts';
import { renderArtifacts } from '../src/render/artifacts.ts';
import { defaultGoldenScenario, goldenVectorsOf, tryPlanDesign } from '@loopwright/dsp';
import { computeRelease } from '../src/render/compute.ts';
import { writeBundle } from '../src/releases/bundle.ts';
import { createReleaseServices } from '../src/releases/index.ts';
import { seedDemo } from '../src/seed.ts';
import { createServices } from '../src/services/index.ts';

const ROOT = path.resolve(import.meta.dirname, '../../..');
const ITERATIONS = 30;
const WARM_UP = 5;
const TARGET_MS = 100;
/** Issue 16: golden vectors at >= 5 M samples per second (of process CPU time, so the shared machine's load does not count). */
const VECTOR_TARGET_SAMPLES_PER_S = 5_000_000;

/** Process CPU time in ms (user + system). */
const cpuNow = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};

const now = () => performance.now();

function stats(values: readonly number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
  const round = (x: number) => Math.round(x * 100) / 100;
  return { medianMs: round(at(0.5)), p90Ms: round(at(0.9)), maxMs: round(sorted[sorted.length - 1] ?? NaN) };
}

/** A sink that counts bytes, standing in for the HTTP response. */
function nullSink(): Writable & { bytes: number } {
  const sink = new Writable({
    write(chunk: Buffer, _enc, cb) {
      sink.bytes += chunk.length;
      cb();
    },
  }) as Writable & { bytes: number };
  sink.bytes = 0;
  return sink;
}

/**
 * The golden-vector run alone (goldenVectorsOf on the release's default scenario, as planDesign runs
 * it for a cut): samples per second of process CPU time over 200 runs after 100 to warm up.
 */
function goldenVectorCpuSamplesPerS(spec: unknown): number {
  const planned = tryPlanDesign(spec);
  if (!planned.ok) throw new Error('the spec does not plan');
  const { plan } = planned;
  const loop = { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue };
  const scenario = defaultGoldenScenario(plan.spec);
  for (let i = 0; i < 100; i++) goldenVectorsOf(loop, scenario);
  let samples = 0;
  const c0 = cpuNow();
  for (let i = 0; i < 200; i++) samples += goldenVectorsOf(loop, scenario).record.length;
  return Math.round((samples / Math.max(1e-3, cpuNow() - c0)) * 1000);
}

export async function runReleaseBench(): Promise<object> {
  const dataDir = path.join(ROOT, '.data', 'bench-release');
  const db = await startMariaDb({ dataDir, fresh: true, database: 'loopwright_bench', user: 'loopwright', password: 'bench-only-password' });
  const config = loadConfig({
    NODE_ENV: 'test',
    ...dbEnv(db),
    LW_BCRYPT_ROUNDS: '4',
    LW_FILE_STORE_DIR: path.join(dataDir, 'files'),
  });
  const dataSource = createDataSource(config.db);
  await dataSource.initialize();
  const services = createServices(dataSource, config);
  // No mail is sent while cutting; the outbox timer stays off.
  const handoff = createReleaseServices(dataSource, { ...services, files: services.handoff.files }, loadHandoffConfig({ LW_OUTBOX_INTERVAL_MS: '0' }));
  try {
    await runMigrations(dataSource);
    await seedDemo(dataSource, config.bcryptRounds);
    const designer = await dataSource.getRepository(User).findOneByOrFail({ email: 'designer@example.test' });
    const actor = { id: designer.id, email: designer.email, ip: null };
    const designs = await dataSource.getRepository(Design).find({ order: { id: 'ASC' } });
    const perDesign = [];
    for (const d of designs) {
      const record = await services.designs.get(designer.organizationId, d.id);
      const phases = { recompute: [] as number[], vectors: [] as number[], render: [] as number[], store: [] as number[], zip: [] as number[], total: [] as number[] };
      let samples = 0;
      let bundleBytes = 0;
      for (let i = 0; i < WARM_UP + ITERATIONS; i++) {
        // The plan without and with its golden vectors: the difference is the vector simulation.
        const t0 = now();
        if (!tryPlanDesign(record.spec).ok) throw new Error(`${record.spec.name} does not plan`);
        const t1 = now();
        const computed = computeRelease(record.spec);
        if (!computed.ok) throw new Error(`${record.spec.name} cannot be released`);
        const t2 = now();
        const rendered = renderArtifacts(computed.release);
        const t3 = now();
        const releaseId = await handoff.releases.store(record, rendered, actor);
        const t4 = now();
        const sink = nullSink();
        await writeBundle(sink, `${record.spec.name}-bench`, rendered.files.map((f) => ({ name: f.name, content: f.bytes })), new Date(0));
        const t5 = now();
        if (i < WARM_UP) continue;
        const planMs = t1 - t0;
        phases.recompute.push(planMs);
        phases.vectors.push(t2 - t1 - planMs);
        phases.render.push(t3 - t2);
        phases.store.push(t4 - t3);
        phases.zip.push(t5 - t4);
        phases.total.push(planMs + (t5 - t2));
        samples = computed.release.plan.goldenVectors.record.length;
        bundleBytes = sink.bytes;
        void releaseId;
      }
      const total = stats(phases.total);
      const cpuSamplesPerS = goldenVectorCpuSamplesPerS(record.spec);
      perDesign.push({
        design: record.spec.name,
        serverMsExcludingVectors: total,
        met: total.medianMs < TARGET_MS,
        phases: { recompute: stats(phases.recompute), render: stats(phases.render), store: stats(phases.store), zip: stats(phases.zip) },
        /** Everything computeRelease adds to the plan: golden vectors, their CSV and hex files, the measured acquisition. */
        releaseComputations: { ...stats(phases.vectors) },
        goldenVectors: {
          samples,
          cpuSamplesPerS,
          target: VECTOR_TARGET_SAMPLES_PER_S,
          met: cpuSamplesPerS >= VECTOR_TARGET_SAMPLES_PER_S,
        },
        bundleBytes,
      });
    }
    return {
      what: 'cut a release of each demo design: recompute + render + store + zip, golden-vector simulation apart',
      iterations: ITERATIONS,
      targetMs: TARGET_MS,
      met: perDesign.every((p) => p.met),
      designs: perDesign,
    };
  } finally {
    handoff.close();
    await services.compute.close();
    await dataSource.destroy();
    await db.stop();
    await fs.rm(dataDir, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  runReleaseBench().then((r) => process.stdout.write(`${JSON.stringify(r, null, 2)}\n`));
}
