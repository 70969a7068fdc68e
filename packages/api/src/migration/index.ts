import { CoreSchema1796174100720 } from './1796174100720-CoreSchema.ts';
import { SessionsAndAuditGuards1796174100800 } from './1796174100800-SessionsAndAuditGuards.ts';

/** Listed explicitly, in order: TypeORM's glob loading does not work under Vitest (STACK.md). */
export const coreMigrations = [CoreSchema1796174100720, SessionsAndAuditGuards1796174100800];
