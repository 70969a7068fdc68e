import { CoreSchema1796174100720 } from './1796174100720-CoreSchema.ts';
import { SessionsAndAuditGuards1796174100800 } from './1796174100800-SessionsAndAuditGuards.ts';
import { AuditOrganization1796176449041 } from './1796176449041-AuditOrganization.ts';

/** Listed explicitly: TypeORM's glob loading does not work under Vitest (STACK.md). TypeORM runs all
 * migrations (these and the release module's) in timestamp order. */
export const coreMigrations = [CoreSchema1796174100720, SessionsAndAuditGuards1796174100800, AuditOrganization1796176449041];
