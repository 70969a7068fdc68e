import { MigrationInterface, QueryRunner } from "typeorm";

/** Release file bytes move to the file store (LW_FILE_STORE_DIR); rows cut before keep theirs. */
export class ReleaseFilesInStore1796190000100 implements MigrationInterface {
    name = 'ReleaseFilesInStore1796190000100'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE \`release_files\` MODIFY \`content\` longblob NULL`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        // Rows whose bytes are in the store cannot go back into a NOT NULL column without them.
        await queryRunner.query(`ALTER TABLE \`release_files\` MODIFY \`content\` longblob NOT NULL`);
    }

}
