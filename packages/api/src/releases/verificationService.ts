/**
 * The server's verification of every release's reference RTL, off the request thread: the cut queues
 * a row of release_verifications (in the cut's transaction), and a worker in each API process claims
 * one queued row at a time with SELECT … FOR UPDATE SKIP LOCKED, so two processes never run the same
 * job and none waits for another's lock. It writes the release's stored files to a folder of its
 * own, runs the testbenches (rtl/verify.ts: GHDL and Icarus as child processes with a timeout), then
 * the yosys estimate (cached by content hash), and records each step on the row. A claim carries a
 * lease renewed while the job runs; a job whose process stopped is taken over after the lease, at
 * most MAX_ATTEMPTS times. The release's files and manifest are only read, never changed.
 */
import { randomBytes } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import type { DataSource, EntityManager } from 'typeorm';
import {
  releaseVerificationSchema,
  resourceEstimateSchema,
  rtlVerificationSchema,
  type ReleaseVerificationRecord,
  type RtlVerdict,
  type RtlVerification,
} from '@loopwright/contract';
import { rtlFolder } from '../rtl/releaseFolder.ts';
import { verifyFolder } from '../rtl/verify.ts';
import type { EstimateCache } from './estimateCache.ts';
import { ReleaseVerification } from './entities/index.ts';
import type { FileStore } from '../storage/fileStore.ts';
import { releaseFileBytes } from './fileBytes.ts';

export const MAX_ATTEMPTS = 3;

export interface VerificationSettings {
  readonly intervalMs: number;
  readonly leaseS: number;
  readonly simulatorTimeoutMs: number;
  /** Environment of the simulators (PATH decides which are found); default: the process's. */
  readonly env?: NodeJS.ProcessEnv;
}

export interface Job {
  readonly id: number;
  readonly releaseId: number;
}

type Row = Pick<ReleaseVerification, 'state' | 'progress' | 'verdict' | 'verificationJson' | 'estimateJson' | 'attempts' | 'startedAt' | 'finishedAt'>;

const PASSING: readonly RtlVerdict[] = ['passed', 'partial', 'not-run'];

/** The record of a row, with the one sentence every screen and e-mail shows. */
export function verificationRecord(row: Row | null): ReleaseVerificationRecord {
  if (row === null) {
    return { state: 'queued', progress: null, verdict: null, summary: 'reference RTL verification queued', verification: null, estimate: null, attempts: 0, startedAt: null, finishedAt: null, approvable: false, blockedReason: 'the reference RTL verification has not finished' };
  }
  const verification: RtlVerification | null = row.verificationJson ? rtlVerificationSchema.parse(JSON.parse(row.verificationJson)) : null;
  const verdict = verification?.verdict ?? null;
  const summary = verification?.summary ?? (row.state === 'queued' ? 'reference RTL verification queued' : `reference RTL verification running: ${row.progress ?? 'starting'}`);
  const approvable = verdict !== null && PASSING.includes(verdict);
  const blockedReason = approvable
    ? null
    : verdict === null
      ? 'the reference RTL verification has not finished'
      : `${summary}; approval is blocked: the designer must withdraw this release and cut a new one`;
  return releaseVerificationSchema.parse({
    state: row.state,
    progress: row.progress,
    verdict,
    summary,
    verification,
    estimate: row.estimateJson ? resourceEstimateSchema.parse(JSON.parse(row.estimateJson)) : null,
    attempts: Number(row.attempts),
    startedAt: row.startedAt ? new Date(row.startedAt).toISOString() : null,
    finishedAt: row.finishedAt ? new Date(row.finishedAt).toISOString() : null,
    approvable,
    blockedReason,
  });
}

export class VerificationService {
  /** Which process holds a claim: host, pid and a random tag (a pid can be reused). */
  readonly processId = `${hostname()}:${process.pid}:${randomBytes(4).toString('hex')}`;
  private busy = false;
  private timerStarted = false;

  constructor(
    private readonly dataSource: DataSource,
    private readonly files: FileStore,
    private readonly estimates: EstimateCache,
    private readonly settings: VerificationSettings,
  ) {}

  /** Queue a release's verification, inside the cut's transaction. */
  async queue(manager: EntityManager, releaseId: number): Promise<void> {
    await manager.insert(ReleaseVerification, { releaseId, state: 'queued' });
  }

  async recordFor(manager: EntityManager, releaseId: number): Promise<ReleaseVerificationRecord> {
    const row = await manager.findOne(ReleaseVerification, { where: { releaseId } });
    return verificationRecord(row ?? null);
  }

  /** Claim the oldest queued job (of one release, when given), or one whose lease ran out; null when there is none. */
  async claim(releaseId?: number): Promise<Job | null> {
    return this.dataSource.transaction(async (m) => {
      const rows = (await m.query(
        "SELECT `id`, `releaseId` FROM `release_verifications` WHERE (`state` = 'queued' OR (`state` = 'running' AND `claimedAt` < NOW(3) - INTERVAL ? SECOND)) AND `attempts` < ?" +
          (releaseId === undefined ? '' : ' AND `releaseId` = ?') +
          ' ORDER BY `id` LIMIT 1 FOR UPDATE SKIP LOCKED',
        [this.settings.leaseS, MAX_ATTEMPTS, ...(releaseId === undefined ? [] : [releaseId])],
      )) as { id: number; releaseId: number }[];
      const row = rows[0];
      if (!row) return null;
      await m.query(
        "UPDATE `release_verifications` SET `state` = 'running', `claimedBy` = ?, `claimedAt` = NOW(3), `attempts` = `attempts` + 1, `startedAt` = COALESCE(`startedAt`, NOW(3)), `progress` = 'starting', `verdict` = NULL, `verificationJson` = NULL WHERE `id` = ?",
        [this.processId, row.id],
      );
      return { id: Number(row.id), releaseId: Number(row.releaseId) };
    });
  }

  /** Jobs whose process stopped MAX_ATTEMPTS times end as failed, saying so (never as passed). */
  async giveUpStale(): Promise<void> {
    const record: RtlVerification = { verdict: 'failed', samples: 0, runs: [], summary: `reference RTL verification FAILED: it did not complete in ${MAX_ATTEMPTS} attempts (the process running it stopped each time)` };
    await this.dataSource.query(
      "UPDATE `release_verifications` SET `state` = 'done', `verdict` = 'failed', `verificationJson` = ?, `progress` = NULL, `finishedAt` = NOW(3) WHERE `state` = 'running' AND `claimedAt` < NOW(3) - INTERVAL ? SECOND AND `attempts` >= ?",
      [JSON.stringify(record), this.settings.leaseS, MAX_ATTEMPTS],
    );
  }

  /** Update the claimed row (and renew the lease); false when this process no longer holds it. */
  private async update(job: Job, fields: Record<string, string | null>, done = false): Promise<boolean> {
    const names = Object.keys(fields);
    const set = [...names.map((n) => `\`${n}\` = ?`), '`claimedAt` = NOW(3)', ...(done ? ["`state` = 'done'", '`finishedAt` = NOW(3)'] : [])].join(', ');
    const result = (await this.dataSource.query(`UPDATE \`release_verifications\` SET ${set} WHERE \`id\` = ? AND \`claimedBy\` = ? AND \`state\` = 'running'`, [
      ...names.map((n) => fields[n] ?? null),
      job.id,
      this.processId,
    ])) as { affectedRows?: number };
    return (result.affectedRows ?? 0) > 0;
  }

  /** Claim and run one job (of one release, when given); false when there was none. */
  async runOnce(releaseId?: number): Promise<boolean> {
    await this.giveUpStale();
    const job = await this.claim(releaseId);
    if (!job) return false;
    await this.runClaimed(job);
    return true;
  }

  /** Run jobs until both queues are empty, verifications first (tests, and the timer). */
  async drain(): Promise<number> {
    let n = 0;
    while ((await this.runOnce()) || (await this.estimates.runQueued())) n++;
    return n;
  }

  /** Run a job this process claimed (runOnce does both). */
  async runClaimed(job: Job): Promise<void> {
    const heartbeat = setInterval(() => void this.update(job, {}).catch(() => undefined), (this.settings.leaseS * 1000) / 3);
    heartbeat.unref();
    const dir = mkdtempSync(join(tmpdir(), `lw-release-${job.releaseId}-`));
    try {
      for (const f of await releaseFileBytes(this.dataSource.manager, this.files, job.releaseId)) writeFileSync(join(dir, f.name), f.content);
      if (!(await this.update(job, { progress: 'running the testbenches in GHDL and Icarus' }))) return;
      const env = this.settings.env;
      const verification = await verifyFolder(dir, { timeoutMs: this.settings.simulatorTimeoutMs, ...(env ? { env } : {}) });
      if (!(await this.update(job, { verdict: verification.verdict, verificationJson: JSON.stringify(verification), progress: 'estimating resources with yosys' }))) return;
      const folder = rtlFolder(dir);
      const files = new Map([...folder.verilogFiles, folder.verilogInclude].map((n) => [n, readFileSync(join(dir, n), 'utf8')]));
      const estimate = await this.estimates.estimate({ files, modules: folder.verilogFiles, top: folder.loopEntity });
      await this.update(job, { estimateJson: JSON.stringify(estimate), progress: null }, true);
    } catch (err) {
      // Back to the queue for another attempt (the attempt count stops a job that always fails).
      await this.dataSource.query("UPDATE `release_verifications` SET `state` = 'queued', `progress` = ? WHERE `id` = ? AND `claimedBy` = ?", [
        `retrying after an error: ${(err instanceof Error ? err.message : String(err)).slice(0, 150)}`,
        job.id,
        this.processId,
      ]);
      throw err;
    } finally {
      clearInterval(heartbeat);
      rmSync(dir, { recursive: true, force: true });
    }
  }

  /** Run a job now if the timer is on and this process is idle (after a cut). */
  wake(onError: (err: unknown) => void = () => {}): void {
    if (this.timerStarted) setImmediate(() => this.tick(onError));
  }

  private tick(onError: (err: unknown) => void): void {
    if (this.busy) return;
    this.busy = true;
    this.drain()
      .catch(onError)
      .finally(() => {
        this.busy = false;
      });
  }

  /** Look for work every intervalMs (0: never; tests call runOnce). Returns the stop function. */
  startTimer(onError: (err: unknown) => void = () => {}): () => void {
    if (this.settings.intervalMs <= 0) return () => {};
    this.timerStarted = true;
    const timer = setInterval(() => this.tick(onError), this.settings.intervalMs);
    timer.unref();
    return () => {
      this.timerStarted = false;
      clearInterval(timer);
    };
  }
}
