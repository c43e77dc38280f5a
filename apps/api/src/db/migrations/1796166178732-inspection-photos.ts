import { MigrationInterface, QueryRunner } from "typeorm";

export class InspectionPhotos1796166178732 implements MigrationInterface {
    name = 'InspectionPhotos1796166178732'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "scaffold_inspection" ADD "photo_ids" uuid array NOT NULL DEFAULT '{}'`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "scaffold_inspection" DROP COLUMN "photo_ids"`);
    }

}
