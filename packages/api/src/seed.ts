import bcrypt from 'bcryptjs';
import { ifFmDemodSpec, mainsSyncSpec, ultrasonicSinglePoleSpec, type LoopSpec } from '@loopwright/dsp';
import type { DataSource } from 'typeorm';
import type { Role } from '@loopwright/contract';
import { AuditEntry, Design, Organization, Project, User } from './entities/index.ts';

/** Demo database only (DESIGN.md, "Demo scenario"); the README and the start command print these. */
export const DEMO_PASSWORD = 'loopwright-demo';
export const DEMO_ORGANIZATION = 'Harrow Cove Instruments';
export const DEMO_ACCOUNTS: readonly { email: string; displayName: string; roles: Role[] }[] = [
  { email: 'designer@example.test', displayName: 'Dana Designer', roles: ['designer'] },
  { email: 'reviewer@example.test', displayName: 'Robin Reviewer', roles: ['reviewer'] },
  { email: 'firmware@example.test', displayName: 'Frankie Firmware', roles: ['firmware'] },
  { email: 'admin@example.test', displayName: 'Alex Admin', roles: ['admin'] },
];

const DEMO_PROJECTS: readonly { name: string; description: string; designName: string; spec: LoopSpec }[] = [
  {
    name: 'Inverter mains sync',
    description: '50 Hz mains-synchronisation loop at a 10 kHz update rate for a grid-tie inverter.',
    designName: 'Mains sync PI loop',
    spec: mainsSyncSpec,
  },
  {
    name: 'Ultrasonic flow meter',
    description: '40 kHz ultrasonic flow-meter carrier tracker at 1 MHz.',
    designName: 'Carrier tracker',
    spec: ultrasonicSinglePoleSpec,
  },
  {
    name: 'IF FM demodulator',
    description: '10.7 MHz IF FM demodulator at a 100 MHz clock.',
    designName: 'FM demodulator loop',
    spec: ifFmDemodSpec,
  },
];

export type SeedResult = { seeded: true; organizationId: number } | { seeded: false; reason: string };

/**
 * Inserts the demo scenario, but only into an empty database (no organisation, no account), so it can
 * run on every start without touching real data.
 */
export async function seedDemo(dataSource: DataSource, bcryptRounds = 12): Promise<SeedResult> {
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, bcryptRounds);
  return dataSource.transaction(async (manager) => {
    const [orgs, users] = await Promise.all([manager.count(Organization), manager.count(User)]);
    if (orgs > 0 || users > 0) return { seeded: false, reason: 'the database already holds data' };
    const org = await manager.save(Organization, { name: DEMO_ORGANIZATION });
    const accounts = [];
    for (const account of DEMO_ACCOUNTS) {
      accounts.push(await manager.save(User, { ...account, organizationId: org.id, passwordHash, disabled: false }));
    }
    const designer = accounts[0]!;
    for (const demo of DEMO_PROJECTS) {
      const project = await manager.save(Project, { organizationId: org.id, name: demo.name, description: demo.description, createdById: designer.id, archivedAt: null });
      await manager.save(Design, { projectId: project.id, name: demo.designName, specJson: JSON.stringify(demo.spec), ownerId: designer.id, revision: 1 });
    }
    await manager.insert(AuditEntry, { organizationId: org.id, actorId: null, actorEmail: null, ip: null, action: 'demo.seed', objectType: 'organization', objectId: String(org.id), detailJson: null });
    return { seeded: true, organizationId: org.id };
  });
}

export { runMigrations } from './data-source.ts';
