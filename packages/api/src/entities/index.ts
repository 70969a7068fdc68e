import { AuditEntry } from './AuditEntry.ts';
import { Design } from './Design.ts';
import { Organization } from './Organization.ts';
import { Project } from './Project.ts';
import { User } from './User.ts';

export { AuditEntry, Design, Organization, Project, User };

/** Listed explicitly: TypeORM's glob loading does not work under Vitest (STACK.md). */
export const coreEntities = [Organization, User, Project, Design, AuditEntry];
