import type { DataSource } from 'typeorm';
import type { Config } from '../config.ts';
import { AnalysisService } from './analysis.ts';
import { AuditService } from './audit.ts';
import { ComputePool } from './compute.ts';
import { DesignService } from './designs.ts';
import { ProjectService } from './projects.ts';
import { SessionControl } from './sessions.ts';
import { UserService } from './users.ts';
import { createReleaseServices, type ReleaseServices } from '../releases/index.ts';
import { FileStore } from '../storage/fileStore.ts';

export interface Services {
  readonly dataSource: DataSource;
  readonly audit: AuditService;
  readonly sessions: SessionControl;
  readonly users: UserService;
  readonly projects: ProjectService;
  readonly designs: DesignService;
  readonly compute: ComputePool;
  readonly analysis: AnalysisService;
  /** Releases, reviews, downloads, conformance and the mail outbox (src/releases). */
  readonly handoff: ReleaseServices;
}

export function createServices(dataSource: DataSource, config: Config): Services {
  const audit = new AuditService(dataSource);
  const sessions = new SessionControl(dataSource);
  const users = new UserService(dataSource, audit, sessions, config.bcryptRounds);
  const projects = new ProjectService(dataSource, audit);
  const designs = new DesignService(dataSource, projects, audit);
  const compute = new ComputePool({ threads: config.compute.threads, timeoutMs: config.compute.timeoutS * 1000, maxQueue: config.compute.maxQueue, niceIncrement: config.compute.niceIncrement, warm: config.compute.warm });
  const analysis = new AnalysisService(compute, designs, config.compute.maxSimulationSamples);
  const handoff = createReleaseServices(dataSource, { audit, designs, compute, files: new FileStore(config.fileStoreDir) });
  return { dataSource, audit, sessions, users, projects, designs, compute, analysis, handoff };
}
