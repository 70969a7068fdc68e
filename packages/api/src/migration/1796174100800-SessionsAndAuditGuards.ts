import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Hand-written: the session table of express-mysql-session (its own schema.sql, which the store is told
 * not to create itself), the sign-in rate-limit counters, and triggers that make the audit trail append-only even for a stray UPDATE or
 * DELETE. None is an entity, so the schema-drift check ignores them.
 */
export class SessionsAndAuditGuards1796174100800 implements MigrationInterface {
  name = 'SessionsAndAuditGuards1796174100800';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      'CREATE TABLE `sessions` (' +
        '`session_id` varchar(128) COLLATE utf8mb4_bin NOT NULL, ' +
        '`expires` int(11) unsigned NOT NULL, ' +
        '`data` mediumtext COLLATE utf8mb4_bin, ' +
        'PRIMARY KEY (`session_id`), INDEX `IDX_sessions_expires` (`expires`)' +
        ') ENGINE=InnoDB',
    );
    // Sign-in attempt counters shared by every API process (express-rate-limit store, services/rateLimitStore.ts).
    await queryRunner.query(
      'CREATE TABLE `rate_limit_hits` (' +
        '`bucket` varchar(191) COLLATE utf8mb4_bin NOT NULL, ' +
        '`hits` int unsigned NOT NULL, ' +
        '`resetAt` datetime(3) NOT NULL, ' +
        'PRIMARY KEY (`bucket`)' +
        ') ENGINE=InnoDB',
    );
    for (const event of ['UPDATE', 'DELETE']) {
      await queryRunner.query(
        `CREATE TRIGGER \`audit_entries_no_${event.toLowerCase()}\` BEFORE ${event} ON \`audit_entries\` ` +
          `FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'audit_entries is append-only'`,
      );
    }
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query('DROP TRIGGER IF EXISTS `audit_entries_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `audit_entries_no_update`');
    await queryRunner.query('DROP TABLE `rate_limit_hits`');
    await queryRunner.query('DROP TABLE `sessions`');
  }
}
