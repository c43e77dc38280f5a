import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * A stand-down remembers the job's status before it, how it was re-planned and when the forecast it saw was fetched,
 * so settling it can put the job back as it was.
 */
export class WeatherHoldSettling1796245216000 implements MigrationInterface {
    name = 'WeatherHoldSettling1796245216000'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "weather_hold" ADD "job_status_before" text`);
        await queryRunner.query(`ALTER TABLE "weather_hold" ADD "replan_mode" text`);
        await queryRunner.query(`ALTER TABLE "weather_hold" ADD "forecast_fetched_at" TIMESTAMP WITH TIME ZONE`);
        await queryRunner.query(`ALTER TABLE "weather_hold" ADD "forecast_was_stale" boolean NOT NULL DEFAULT false`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "weather_hold" DROP COLUMN "forecast_was_stale"`);
        await queryRunner.query(`ALTER TABLE "weather_hold" DROP COLUMN "forecast_fetched_at"`);
        await queryRunner.query(`ALTER TABLE "weather_hold" DROP COLUMN "replan_mode"`);
        await queryRunner.query(`ALTER TABLE "weather_hold" DROP COLUMN "job_status_before"`);
    }

}
