import { MigrationInterface, QueryRunner } from 'typeorm';

/** Days on site, days lost to weather and extra hire weeks now come from the board, the stand-downs and the bookings. */
export class DerivedJobActuals1796166209099 implements MigrationInterface {
    name = 'DerivedJobActuals1796166209099'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "job_actual" DROP COLUMN "working_days"`);
        await queryRunner.query(`ALTER TABLE "job_actual" DROP COLUMN "weather_days_lost"`);
        await queryRunner.query(`ALTER TABLE "job_actual" DROP COLUMN "extra_access_weeks"`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "job_actual" ADD "extra_access_weeks" integer NOT NULL DEFAULT '0'`);
        await queryRunner.query(`ALTER TABLE "job_actual" ADD "weather_days_lost" double precision NOT NULL DEFAULT '0'`);
        await queryRunner.query(`ALTER TABLE "job_actual" ADD "working_days" double precision`);
    }

}
