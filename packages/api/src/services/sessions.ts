import type { DataSource } from 'typeorm';

/**
 * Server-side control over stored sessions (table `sessions`, written by express-mysql-session).
 * Passport keeps the signed-in user under data.passport.user, so a user's sessions are found by
 * JSON_VALUE — a scan, but it runs only when an account is renamed, disabled, re-roled or changes password.
 */
export class SessionControl {
  constructor(private readonly dataSource: DataSource) {}

  /** Writes a new display name into the user's open sessions (each caches who the user is). */
  async renameIn(userId: number, displayName: string): Promise<number> {
    const result: unknown = await this.dataSource.query(
      "UPDATE `sessions` SET `data` = JSON_SET(`data`, '$.passport.user.displayName', ?) WHERE JSON_VALUE(`data`, '$.passport.user.id') = ?",
      [displayName, String(userId)],
    );
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }

  /** Ends every session of the user except `keepSessionId`; returns how many were ended. */
  async endSessionsOf(userId: number, keepSessionId: string | null = null): Promise<number> {
    const result: unknown = await this.dataSource.query(
      "DELETE FROM `sessions` WHERE JSON_VALUE(`data`, '$.passport.user.id') = ? AND `session_id` <> ?",
      [String(userId), keepSessionId ?? ''],
    );
    return (result as { affectedRows?: number }).affectedRows ?? 0;
  }
}
