import type { DataSource } from 'typeorm';
import { AuditService } from './audit.ts';
import { DesignService } from './designs.ts';
import { ProjectService } from './projects.ts';
import { SessionControl } from './sessions.ts';
import { UserService } from './users.ts';

export interface Services {
  readonly dataSource: DataSource;
  readonly audit: AuditService;
  readonly sessions: SessionControl;
  readonly users: UserService;
  readonly projects: ProjectService;
  readonly designs: DesignService;
}

export function createServices(dataSource: DataSource, options: { bcryptRounds: number }): Services {
  const audit = new AuditService(dataSource);
  const sessions = new SessionControl(dataSource);
  const users = new UserService(dataSource, audit, sessions, options.bcryptRounds);
  const projects = new ProjectService(dataSource, audit);
  const designs = new DesignService(dataSource, projects, audit);
  return { dataSource, audit, sessions, users, projects, designs };
}
