import { MigrationInterface, QueryRunner } from "typeorm";

export class CoreSchema1796174100720 implements MigrationInterface {
    name = 'CoreSchema1796174100720'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE \`audit_entries\` (\`id\` bigint UNSIGNED NOT NULL AUTO_INCREMENT, \`at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`actorId\` int UNSIGNED NULL, \`actorEmail\` varchar(254) NULL, \`action\` varchar(64) NOT NULL, \`objectType\` varchar(32) NOT NULL, \`objectId\` varchar(64) NULL, \`ip\` varchar(45) NULL, \`detailJson\` longtext NULL, INDEX \`IDX_audit_actor\` (\`actorId\`), INDEX \`IDX_audit_object\` (\`objectType\`, \`objectId\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`organizations\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`name\` varchar(200) NOT NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`users\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`organizationId\` int UNSIGNED NOT NULL, \`email\` varchar(254) NOT NULL, \`displayName\` varchar(120) NOT NULL, \`passwordHash\` varchar(60) NOT NULL, \`roles\` set ('designer', 'reviewer', 'firmware', 'admin') NOT NULL, \`disabled\` tinyint NOT NULL DEFAULT 0, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`updatedAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), UNIQUE INDEX \`UQ_users_email\` (\`email\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`projects\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`organizationId\` int UNSIGNED NOT NULL, \`name\` varchar(120) NOT NULL, \`description\` text NOT NULL, \`createdById\` int UNSIGNED NOT NULL, \`archivedAt\` datetime(3) NULL, \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`updatedAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX \`IDX_projects_org_archived\` (\`organizationId\`, \`archivedAt\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`CREATE TABLE \`designs\` (\`id\` int UNSIGNED NOT NULL AUTO_INCREMENT, \`projectId\` int UNSIGNED NOT NULL, \`name\` varchar(120) NOT NULL, \`specJson\` longtext NOT NULL, \`ownerId\` int UNSIGNED NOT NULL, \`revision\` int UNSIGNED NOT NULL DEFAULT '1', \`createdAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), \`updatedAt\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX \`IDX_designs_project\` (\`projectId\`), PRIMARY KEY (\`id\`)) ENGINE=InnoDB`);
        await queryRunner.query(`ALTER TABLE \`users\` ADD CONSTRAINT \`FK_f3d6aea8fcca58182b2e80ce979\` FOREIGN KEY (\`organizationId\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`projects\` ADD CONSTRAINT \`FK_eec93fd979bdcf5a0141da324d6\` FOREIGN KEY (\`organizationId\`) REFERENCES \`organizations\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`projects\` ADD CONSTRAINT \`FK_f55144dc92df43cd1dad5d29b90\` FOREIGN KEY (\`createdById\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`designs\` ADD CONSTRAINT \`FK_72a422a52251b249af167cdee83\` FOREIGN KEY (\`projectId\`) REFERENCES \`projects\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE \`designs\` ADD CONSTRAINT \`FK_69f1af839095bbcb280b4391644\` FOREIGN KEY (\`ownerId\`) REFERENCES \`users\`(\`id\`) ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`designs\` DROP FOREIGN KEY \`FK_69f1af839095bbcb280b4391644\``);
        await queryRunner.query(`ALTER TABLE \`designs\` DROP FOREIGN KEY \`FK_72a422a52251b249af167cdee83\``);
        await queryRunner.query(`ALTER TABLE \`projects\` DROP FOREIGN KEY \`FK_f55144dc92df43cd1dad5d29b90\``);
        await queryRunner.query(`ALTER TABLE \`projects\` DROP FOREIGN KEY \`FK_eec93fd979bdcf5a0141da324d6\``);
        await queryRunner.query(`ALTER TABLE \`users\` DROP FOREIGN KEY \`FK_f3d6aea8fcca58182b2e80ce979\``);
        await queryRunner.query(`DROP INDEX \`IDX_designs_project\` ON \`designs\``);
        await queryRunner.query(`DROP TABLE \`designs\``);
        await queryRunner.query(`DROP INDEX \`IDX_projects_org_archived\` ON \`projects\``);
        await queryRunner.query(`DROP TABLE \`projects\``);
        await queryRunner.query(`DROP INDEX \`UQ_users_email\` ON \`users\``);
        await queryRunner.query(`DROP TABLE \`users\``);
        await queryRunner.query(`DROP TABLE \`organizations\``);
        await queryRunner.query(`DROP INDEX \`IDX_audit_object\` ON \`audit_entries\``);
        await queryRunner.query(`DROP INDEX \`IDX_audit_actor\` ON \`audit_entries\``);
        await queryRunner.query(`DROP TABLE \`audit_entries\``);
    }

}
