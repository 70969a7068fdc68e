import { MigrationInterface, QueryRunner } from "typeorm";

export class DesignArchive1796228462742 implements MigrationInterface {
    name = 'DesignArchive1796228462742'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`designs\` ADD \`archivedAt\` datetime(3) NULL`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`designs\` DROP COLUMN \`archivedAt\``);
    }

}
