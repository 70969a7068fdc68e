/** The hand-off half: releases, reviews and review links, downloads, conformance and the mail outbox. */
import type { DataSource } from 'typeorm';
import { loadHandoffConfig, type HandoffConfig } from '../mail/config.ts';
import { MailOutbox } from '../mail/outbox.ts';
import { createMailTransport } from '../mail/transport.ts';
import type { AuditService } from '../services/audit.ts';
import type { DesignService } from '../services/designs.ts';
import type { FileStore } from '../storage/fileStore.ts';
import type { ComputePool } from '../services/compute.ts';
import { ConformanceService } from './conformanceService.ts';
import { DownloadService } from './downloadService.ts';
import { ReleaseService } from './releaseService.ts';
import { ReviewService } from './reviewService.ts';
import { EstimateCache } from './estimateCache.ts';
import { VerificationService } from './verificationService.ts';

export interface ReleaseServices {
  readonly config: HandoffConfig;
  readonly outbox: MailOutbox;
  readonly releases: ReleaseService;
  readonly reviews: ReviewService;
  readonly downloads: DownloadService;
  readonly conformance: ConformanceService;
  /** Where release file bytes are stored (LW_FILE_STORE_DIR). */
  readonly files: FileStore;
  readonly verification: VerificationService;
  readonly estimates: EstimateCache;
  /** Stops the outbox and verification timers (part of the app's close()). */
  close(): void;
}

export function createReleaseServices(
  dataSource: DataSource,
  deps: { readonly audit: AuditService; readonly designs: DesignService; readonly files: FileStore; readonly compute: ComputePool },
  config: HandoffConfig = loadHandoffConfig(),
): ReleaseServices {
  const outbox = new MailOutbox(dataSource, createMailTransport(config.smtp), config.mailFrom, config.outboxFirstRetryS);
  const v = config.verification;
  const toolEnv = v.toolEnv ? { env: v.toolEnv } : {};
  const estimates = new EstimateCache(dataSource, { timeoutMs: v.estimateTimeoutMs, ...toolEnv });
  const verification = new VerificationService(dataSource, deps.files, estimates, { intervalMs: v.intervalMs, leaseS: v.leaseS, simulatorTimeoutMs: v.simulatorTimeoutMs, ...toolEnv });
  const releases = new ReleaseService(dataSource, deps.designs, deps.audit, deps.files, deps.compute, verification);
  deps.designs.addDeletionGuard(async (designId, manager) => {
    const n = await releases.releaseCount(designId, manager);
    return n > 0 ? `it has ${n} release(s), which are kept for the record` : null;
  });
  const stopOutbox = outbox.startTimer(config.outboxIntervalMs);
  const stopVerification = verification.startTimer((err) => console.error('release verification failed to run:', err));
  return {
    config,
    outbox,
    releases,
    reviews: new ReviewService(dataSource, releases, deps.audit, outbox, config),
    downloads: new DownloadService(dataSource, releases, deps.audit),
    conformance: new ConformanceService(dataSource, releases, deps.audit, deps.compute),
    files: deps.files,
    verification,
    estimates,
    close: () => {
      stopOutbox();
      stopVerification();
    },
  };
}

export { releaseEntities } from './entities/index.ts';
