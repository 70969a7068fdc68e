/**
 * yosys estimates in MariaDB, keyed by the SHA-256 of what was synthesised (yosys's version line and
 * every source file, name and bytes): any API process reuses an estimate another one made, and the
 * same RTL is synthesised once. `request` (the word-length search's cost column) answers from the
 * cache or queues the sources; each process's worker claims queued rows with SELECT … FOR UPDATE SKIP
 * LOCKED and synthesises them as child processes. "Not estimated" because yosys is missing is never
 * stored: yosys may be installed later.
 */
import { createHash, randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import type { DataSource } from 'typeorm';
import { resourceEstimateSchema, type CandidateEstimate, type ResourceEstimate } from '@loopwright/contract';
import { computeDesign } from '../render/compute.ts';
import { synthesisSources } from '../render/synthesisSources.ts';
import { estimateResources, type EstimateOptions, type VerilogSources } from '../rtl/estimate.ts';
import { toolVersion } from '../rtl/processes.ts';
import { RtlEstimate } from './entities/index.ts';

export function estimateKey(version: string, sources: VerilogSources): string {
  const hash = createHash('sha256').update(version).update('\0').update(sources.top);
  for (const name of [...sources.files.keys()].sort()) hash.update('\0').update(name).update('\0').update(sources.files.get(name)!);
  return hash.digest('hex');
}

/** A queued estimate's lease, and the attempts before it ends as "not estimated". */
const LEASE_S = 900;
const MAX_ATTEMPTS = 3;

export type EstimateAnswer = { readonly state: 'pending' } | ResourceEstimate;

interface StoredSources {
  readonly files: [string, string][];
  readonly modules: string[];
  readonly top: string;
}

export class EstimateCache {
  private readonly processId = `${hostname()}:${process.pid}:${randomBytes(4).toString('hex')}`;

  constructor(
    private readonly dataSource: DataSource,
    private readonly options: EstimateOptions = {},
  ) {}

  private async keyOf(sources: VerilogSources): Promise<string | null> {
    const version = await toolVersion('yosys', '-V', this.options.env);
    return version === null ? null : estimateKey(version, sources);
  }

  private async done(key: string): Promise<ResourceEstimate | null> {
    const row = await this.dataSource.getRepository(RtlEstimate).findOne({ where: { contentSha256: key, state: 'done' } });
    return row?.estimateJson ? resourceEstimateSchema.parse(JSON.parse(row.estimateJson)) : null;
  }

  private async store(key: string, estimate: ResourceEstimate): Promise<void> {
    await this.dataSource.query(
      "INSERT INTO `rtl_estimates` (`contentSha256`, `state`, `estimateJson`) VALUES (?, 'done', ?) ON DUPLICATE KEY UPDATE `state` = 'done', `estimateJson` = VALUES(`estimateJson`), `sourcesJson` = NULL",
      [key, JSON.stringify(estimate)],
    );
  }

  /** The estimate, from the cache or by running yosys now (then cached): the verification job's way. */
  async estimate(sources: VerilogSources): Promise<ResourceEstimate> {
    const key = await this.keyOf(sources);
    if (key === null) return { state: 'not-estimated', reason: 'yosys is not installed' };
    const cached = await this.done(key);
    if (cached) return cached;
    const estimate = await estimateResources(sources, this.options);
    if (estimate.state === 'estimated') await this.store(key, estimate);
    return estimate;
  }

  /** The cached estimate, or "pending" after queueing the sources for a worker. */
  async request(sources: VerilogSources): Promise<EstimateAnswer> {
    const key = await this.keyOf(sources);
    if (key === null) return { state: 'not-estimated', reason: 'yosys is not installed' };
    const cached = await this.done(key);
    if (cached) return cached;
    const stored: StoredSources = { files: [...sources.files], modules: [...sources.modules], top: sources.top };
    await this.dataSource.query("INSERT IGNORE INTO `rtl_estimates` (`contentSha256`, `state`, `sourcesJson`) VALUES (?, 'queued', ?)", [key, JSON.stringify(stored)]);
    return { state: 'pending' };
  }

  /** The cost of each candidate spec (word-length search): cached totals, "pending" while queued, or why not. */
  async candidates(specs: readonly unknown[]): Promise<CandidateEstimate[]> {
    const out: CandidateEstimate[] = [];
    for (const spec of specs) {
      const computed = computeDesign(spec);
      if (!computed.ok) {
        const issue = computed.issues[0];
        out.push({ state: 'invalid', field: issue?.field ?? '', message: computed.issues.map((i) => i.message).join('; ') });
        continue;
      }
      const sources: VerilogSources = synthesisSources(computed.plan);
      const answer = await this.request(sources);
      out.push(answer.state === 'estimated' ? { state: 'estimated', tool: answer.tool, label: answer.label, total: answer.total } : answer);
    }
    return out;
  }

  /** Claim one queued estimate (or one whose lease ran out) and synthesise it; false when there is none. */
  async runQueued(): Promise<boolean> {
    const job = await this.dataSource.transaction(async (m) => {
      const rows = (await m.query(
        "SELECT `contentSha256`, `sourcesJson`, `attempts` FROM `rtl_estimates` WHERE (`state` = 'queued' OR (`state` = 'running' AND `claimedAt` < NOW(3) - INTERVAL ? SECOND)) ORDER BY `createdAt` LIMIT 1 FOR UPDATE SKIP LOCKED",
        [LEASE_S],
      )) as { contentSha256: string; sourcesJson: string | null; attempts: number }[];
      const row = rows[0];
      if (!row) return null;
      await m.query("UPDATE `rtl_estimates` SET `state` = 'running', `claimedBy` = ?, `claimedAt` = NOW(3), `attempts` = `attempts` + 1 WHERE `contentSha256` = ?", [this.processId, row.contentSha256]);
      return row;
    });
    if (!job) return false;
    let estimate: ResourceEstimate;
    if (job.sourcesJson === null || Number(job.attempts) >= MAX_ATTEMPTS) {
      estimate = { state: 'not-estimated', reason: `yosys did not finish this estimate in ${MAX_ATTEMPTS} attempts` };
    } else {
      const s = JSON.parse(job.sourcesJson) as StoredSources;
      estimate = await estimateResources({ files: new Map(s.files), modules: s.modules, top: s.top }, this.options);
    }
    // A failure of yosys itself is kept as the answer, so the search stops asking; it names the reason.
    await this.dataSource.query("UPDATE `rtl_estimates` SET `state` = 'done', `estimateJson` = ?, `sourcesJson` = NULL WHERE `contentSha256` = ? AND `claimedBy` = ?", [
      JSON.stringify(estimate),
      job.contentSha256,
      this.processId,
    ]);
    return true;
  }
}
