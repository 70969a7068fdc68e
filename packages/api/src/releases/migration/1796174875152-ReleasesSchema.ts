import { MigrationInterface, QueryRunner } from "typeorm";

export class ReleasesSchema1796174875152 implements MigrationInterface {
    name = 'ReleasesSchema1796174875152'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE \`conformance_runs\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`releaseId\` int UNSIGNED NOT NULL, \`uploadedById\` int UNSIGNED NOT NULL, \`fileName\` varchar(255) NOT NULL, \`sizeBytes\` int UNSIGNED NOT NULL, \`sha256\` char(64) NOT NULL, \`verdict\` enum ('bit-exact', 'mismatch') NOT NULL, \`samplesCompared\` int UNSIGNED NOT NULL, \`mismatchCount\` int UNSIGNED NOT NULL, \`firstMismatchesJson\` longtext NOT NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX \`IDX_conformance_runs_release\` (\`releaseId\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`mail_outbox\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`toAddress\` varchar(254) NOT NULL, \`subject\` varchar(255) NOT NULL, \`textBody\` longtext NOT NULL, \`kind\` varchar(32) NOT NULL, \`attempts\` int UNSIGNED NOT NULL DEFAULT '0', \`lastError\` varchar(500) NULL, \`nextAttemptAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`claimedUntil\` datetime(3) NULL, \`sentAt\` datetime(3) NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX \`IDX_mail_outbox_pending\` (\`sentAt\`, \`nextAttemptAt\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`releases\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`designId\` int UNSIGNED NOT NULL, \`number\` int UNSIGNED NOT NULL, \`state\` enum ('draft', 'in-review', 'approved', 'changes-requested', 'withdrawn') NOT NULL DEFAULT 'draft', \`specJson\` longtext NOT NULL, \`resultsJson\` longtext NOT NULL, \`specSha256\` char(64) NOT NULL, \`manifestSha256\` char(64) NOT NULL, \`designRevision\` int UNSIGNED NOT NULL, \`approvalsRequired\` int UNSIGNED NULL, \`createdById\` int UNSIGNED NOT NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`stateChangedAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX \`UQ_releases_design_number\` (\`designId\`, \`number\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`release_downloads\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`releaseId\` int UNSIGNED NOT NULL, \`userId\` int UNSIGNED NOT NULL, \`userEmail\` varchar(254) NOT NULL, \`fileName\` varchar(80) NOT NULL, \`ip\` varchar(45) NULL, \`at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX \`IDX_release_downloads_release\` (\`releaseId\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`release_files\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`releaseId\` int UNSIGNED NOT NULL, \`position\` smallint UNSIGNED NOT NULL, \`name\` varchar(80) NOT NULL, \`mediaType\` varchar(64) NOT NULL, \`sizeBytes\` int UNSIGNED NOT NULL, \`sha256\` char(64) NOT NULL, \`content\` longblob NOT NULL, UNIQUE INDEX \`UQ_release_files_name\` (\`releaseId\`, \`name\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`release_reviews\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`releaseId\` int UNSIGNED NOT NULL, \`reviewerId\` int UNSIGNED NOT NULL, \`requestedById\` int UNSIGNED NOT NULL, \`selector\` char(12) NOT NULL, \`tokenHash\` char(64) NOT NULL, \`manifestSha256\` char(64) NOT NULL, \`expiresAt\` datetime(3) NOT NULL, \`usedAt\` datetime(3) NULL, \`decision\` enum ('approve', 'request-changes') NULL, \`comment\` text NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), UNIQUE INDEX \`UQ_release_reviews_selector\` (\`selector\`), UNIQUE INDEX \`UQ_release_reviews_reviewer\` (\`releaseId\`, \`reviewerId\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`ALTER TABLE \`releases\` ADD CONSTRAINT \`FK_77fbfd280d1e20f0697cf9d5244\` FOREIGN KEY (\`designId\`) REFERENCES \`designs\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`releases\` ADD CONSTRAINT \`FK_880b0f5134d01db0bf1821502bb\` FOREIGN KEY (\`createdById\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`release_files\` ADD CONSTRAINT \`FK_b9e82c8ac5c06f316d096ccede8\` FOREIGN KEY (\`releaseId\`) REFERENCES \`releases\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`release_reviews\` ADD CONSTRAINT \`FK_38d7bf8fc300fa3caf4862a3c3b\` FOREIGN KEY (\`releaseId\`) REFERENCES \`releases\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`release_reviews\` ADD CONSTRAINT \`FK_40b495256c827544dd31a40a21a\` FOREIGN KEY (\`reviewerId\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`release_reviews\` DROP FOREIGN KEY \`FK_40b495256c827544dd31a40a21a\``);
        await queryRunner.query(`ALTER TABLE \`release_reviews\` DROP FOREIGN KEY \`FK_38d7bf8fc300fa3caf4862a3c3b\``);
        await queryRunner.query(`ALTER TABLE \`release_files\` DROP FOREIGN KEY \`FK_b9e82c8ac5c06f316d096ccede8\``);
        await queryRunner.query(`ALTER TABLE \`releases\` DROP FOREIGN KEY \`FK_880b0f5134d01db0bf1821502bb\``);
        await queryRunner.query(`ALTER TABLE \`releases\` DROP FOREIGN KEY \`FK_77fbfd280d1e20f0697cf9d5244\``);
        await queryRunner.query(`DROP INDEX \`UQ_release_reviews_reviewer\` ON \`release_reviews\``);
        await queryRunner.query(`DROP INDEX \`UQ_release_reviews_selector\` ON \`release_reviews\``);
        await queryRunner.query(`DROP TABLE \`release_reviews\``);
        await queryRunner.query(`DROP INDEX \`UQ_release_files_name\` ON \`release_files\``);
        await queryRunner.query(`DROP TABLE \`release_files\``);
        await queryRunner.query(`DROP INDEX \`IDX_release_downloads_release\` ON \`release_downloads\``);
        await queryRunner.query(`DROP TABLE \`release_downloads\``);
        await queryRunner.query(`DROP INDEX \`UQ_releases_design_number\` ON \`releases\``);
        await queryRunner.query(`DROP TABLE \`releases\``);
        await queryRunner.query(`DROP INDEX \`IDX_mail_outbox_pending\` ON \`mail_outbox\``);
        await queryRunner.query(`DROP TABLE \`mail_outbox\``);
        await queryRunner.query(`DROP INDEX \`IDX_conformance_runs_release\` ON \`conformance_runs\``);
        await queryRunner.query(`DROP TABLE \`conformance_runs\``);
    }

}
