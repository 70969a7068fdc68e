import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * A delivered mail keeps no text: the review links in old rows are credentials. Existing delivered
 * rows lose their text here (it cannot come back on the way down).
 */
export class OutboxDropsDeliveredText1796190000000 implements MigrationInterface {
    name = 'OutboxDropsDeliveredText1796190000000'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`mail_outbox\` MODIFY \`textBody\` longtext NULL`);
        await queryRunner.query(`UPDATE \`mail_outbox\` SET \`textBody\` = NULL WHERE \`sentAt\` IS NOT NULL`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`UPDATE \`mail_outbox\` SET \`textBody\` = '' WHERE \`textBody\` IS NULL`);
        await queryRunner.query(`ALTER TABLE \`mail_outbox\` MODIFY \`textBody\` longtext NOT NULL`);
    }

}
