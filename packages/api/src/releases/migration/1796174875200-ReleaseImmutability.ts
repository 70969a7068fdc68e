import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Hand-written: triggers that keep a cut release as it was cut. Only the review columns of
 * `releases` (state, stateChangedAt, approvalsRequired) may change; artifacts and the download log
 * refuse every UPDATE and DELETE, and releases refuse DELETE. Triggers are not entities, so the
 * schema-drift check ignores them.
 */
const CONTENT_COLUMNS = ['designId', 'number', 'specJson', 'resultsJson', 'specSha256', 'manifestSha256', 'designRevision', 'createdById', 'createdAt'];

export class ReleaseImmutability1796174875200 implements MigrationInterface {
  name = 'ReleaseImmutability1796174875200';

  public async up(queryRunner: QueryRunner): Promise<void> {
    const unchanged = CONTENT_COLUMNS.map((c) => `NEW.\`${c}\` <=> OLD.\`${c}\``).join(' AND ');
    await queryRunner.query(
      'CREATE TRIGGER `releases_content_immutable` BEFORE UPDATE ON `releases` FOR EACH ROW ' +
        `BEGIN IF NOT (${unchanged}) THEN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'a release never changes after it is cut'; END IF; END`,
    );
    await queryRunner.query(
      "CREATE TRIGGER `releases_no_delete` BEFORE DELETE ON `releases` FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'releases are kept for the record'",
    );
    for (const table of ['release_files', 'release_downloads']) {
      for (const event of ['UPDATE', 'DELETE']) {
        await queryRunner.query(
          `CREATE TRIGGER \`${table}_no_${event.toLowerCase()}\` BEFORE ${event} ON \`${table}\` ` +
            `FOR EACH ROW SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = '${table} is insert-only'`,
        );
      }
    }
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    for (const table of ['release_downloads', 'release_files']) {
      await queryRunner.query(`DROP TRIGGER IF EXISTS \`${table}_no_delete\``);
      await queryRunner.query(`DROP TRIGGER IF EXISTS \`${table}_no_update\``);
    }
    await queryRunner.query('DROP TRIGGER IF EXISTS `releases_no_delete`');
    await queryRunner.query('DROP TRIGGER IF EXISTS `releases_content_immutable`');
  }
}
