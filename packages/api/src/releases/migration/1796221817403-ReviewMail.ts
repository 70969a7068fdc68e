import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Each review row points at its request mail in the outbox, so the release page can say whether the
 * link went out or waits for the relay. Reviews requested before this migration keep NULL (not known).
 */
export class ReviewMail1796221817403 implements MigrationInterface {
    name = 'ReviewMail1796221817403'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`release_reviews\` ADD \`mailId\` bigint UNSIGNED NULL`);
        await queryRunner.query(`ALTER TABLE \`release_reviews\` ADD CONSTRAINT \`FK_c05b1eac75ec52e4b5736d117b9\` FOREIGN KEY (\`mailId\`) REFERENCES \`mail_outbox\`(\`id\`) ON DELETE SET NULL ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`release_reviews\` DROP FOREIGN KEY \`FK_c05b1eac75ec52e4b5736d117b9\``);
        await queryRunner.query(`ALTER TABLE \`release_reviews\` DROP COLUMN \`mailId\``);
    }

}
