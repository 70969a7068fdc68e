import type { DataSource } from 'typeorm';

/**
 * Server-side control over stored sessions (table `sessions`, written by express-mysql-session).
 * Passport keeps the signed-in user under data.passport.user, so a user's sessions are found by
 * JSON_VALUE — a scan, but it runs only when an account is disabled, re-roled or changes password.
 */
export class SessionControl {
  constructor(private readonly dataSource: DataSource) {}

  /** Ends every session of the user except `keepSessionId`; returns how many were ended. */
  async endSessionsOf(userId: number, keepSessionId: string | null = null): Promise<number> {
    const result: unknown = await this.dataSource.query(
      "DELETE FROM `sessions` WHERE JSON_VALUE(`data`, '$.passport.user.id') = ? AND `session_id` <> ?",
      [String(userId), keepSessionId ?? ''],
    );
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }
}
