import { MigrationInterface, QueryRunner } from "typeorm";

export class AccessCancelledReason1796244607912 implements MigrationInterface {
    name = 'AccessCancelledReason1796244607912'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "access_booking" ADD "cancelled_reason" text`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "access_booking" DROP COLUMN "cancelled_reason"`);
    }

}
