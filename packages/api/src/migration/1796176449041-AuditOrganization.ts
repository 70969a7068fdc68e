import { MigrationInterface, QueryRunner } from "typeorm";

export class AuditOrganization1796176449041 implements MigrationInterface {
    name = 'AuditOrganization1796176449041'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`audit_entries\` ADD \`organizationId\` int UNSIGNED NULL`);
        await queryRunner.query(`CREATE INDEX \`IDX_audit_org\` ON \`audit_entries\` (\`organizationId\`, \`id\`)`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX \`IDX_audit_org\` ON \`audit_entries\``);
        await queryRunner.query(`ALTER TABLE \`audit_entries\` DROP COLUMN \`organizationId\``);
    }

}
