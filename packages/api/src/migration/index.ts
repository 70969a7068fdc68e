import { CoreSchema1796174100720 } from './1796174100720-CoreSchema.ts';
import { SessionsAndAuditGuards1796174100800 } from './1796174100800-SessionsAndAuditGuards.ts';
import { AuditOrganization1796176449041 } from './1796176449041-AuditOrganization.ts';
import { DesignArchive1796228462742 } from './1796228462742-DesignArchive.ts';

/** Listed explicitly: TypeORM's glob loading does not work under Vitest (STACK.md). TypeORM runs all
 * migrations (these and the release module's) in timestamp order. */
export const coreMigrations = [CoreSchema1796174100720, SessionsAndAuditGuards1796174100800, AuditOrganization1796176449041, DesignArchive1796228462742];
