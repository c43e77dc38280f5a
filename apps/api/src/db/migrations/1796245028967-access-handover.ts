import { MigrationInterface, QueryRunner } from "typeorm";

export class AccessHandover1796245028967 implements MigrationInterface {
    name = 'AccessHandover1796245028967'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "handed_over_on" date`);
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "handed_over_by" text`);
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "competent_person" text`);
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "handover_tag" text`);
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "handover_notes" text`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "handover_notes"`);
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "handover_tag"`);
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "competent_person"`);
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "handed_over_by"`);
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "handed_over_on"`);
    }

}
