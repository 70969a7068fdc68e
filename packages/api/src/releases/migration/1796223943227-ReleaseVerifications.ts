import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The verification record of each release (the job the background worker claims) and the cache and
 * queue of yosys estimates. Every release cut before this migration is queued, so it is verified too.
 */
export class ReleaseVerifications1796223943227 implements MigrationInterface {
    name = 'ReleaseVerifications1796223943227'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE \`release_verifications\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`releaseId\` int UNSIGNED NOT NULL, \`state\` varchar(16) NOT NULL DEFAULT 'queued', \`progress\` varchar(200) NULL, \`attempts\` smallint UNSIGNED NOT NULL DEFAULT '0', \`claimedBy\` varchar(120) NULL, \`claimedAt\` datetime(3) NULL, \`verdict\` varchar(16) NULL, \`verificationJson\` longtext NULL, \`estimateJson\` longtext NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`startedAt\` datetime(3) NULL, \`finishedAt\` datetime(3) NULL, UNIQUE INDEX \`UQ_release_verifications_release\` (\`releaseId\`), INDEX \`IDX_release_verifications_state\` (\`state\`, \`claimedAt\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`rtl_estimates\` (\`contentSha256\` char(64) NOT NULL, \`state\` varchar(16) NOT NULL DEFAULT 'done', \`sourcesJson\` longtext NULL, \`estimateJson\` longtext NULL, \`claimedBy\` varchar(120) NULL, \`claimedAt\` datetime(3) NULL, \`attempts\` smallint UNSIGNED NOT NULL DEFAULT '0', \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX \`IDX_rtl_estimates_state\` (\`state\`, \`claimedAt\`), PRIMARY KEY (\`contentSha256\`)) ENGINE=InnoDB`);
        await queryRunner.query(`ALTER TABLE \`release_verifications\` ADD CONSTRAINT \`FK_ca0bc2664fd57f40210fb14f91a\` FOREIGN KEY (\`releaseId\`) REFERENCES \`releases\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`INSERT INTO \`release_verifications\` (\`releaseId\`) SELECT \`id\` FROM \`releases\``);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`release_verifications\` DROP FOREIGN KEY \`FK_ca0bc2664fd57f40210fb14f91a\``);
        await queryRunner.query(`DROP INDEX \`IDX_rtl_estimates_state\` ON \`rtl_estimates\``);
        await queryRunner.query(`DROP TABLE \`rtl_estimates\``);
        await queryRunner.query(`DROP INDEX \`IDX_release_verifications_state\` ON \`release_verifications\``);
        await queryRunner.query(`DROP INDEX \`UQ_release_verifications_release\` ON \`release_verifications\``);
        await queryRunner.query(`DROP TABLE \`release_verifications\``);
    }

}
