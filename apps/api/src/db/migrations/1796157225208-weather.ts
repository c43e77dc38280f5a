import { MigrationInterface, QueryRunner } from "typeorm";

export class Weather1796157225208 implements MigrationInterface {
    name = 'Weather1796157225208'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "forecast_fetch" ("site_id" uuid NOT NULL, "firm_id" uuid NOT NULL, "last_success_at" TIMESTAMP WITH TIME ZONE, "last_attempt_at" TIMESTAMP WITH TIME ZONE NOT NULL, "last_error" text, "digest" text, CONSTRAINT "PK_fc6e1d5271a5be06ac818dc94fd" PRIMARY KEY ("site_id"))`);
        await queryRunner.query(`CREATE TABLE "forecast_hour" ("site_id" uuid NOT NULL, "time" TIMESTAMP WITH TIME ZONE NOT NULL, "firm_id" uuid NOT NULL, "temp_c" real NOT NULL, "wind_mean_ms" real NOT NULL, "wind_gust_ms" real NOT NULL, "precip_mm" real NOT NULL, "precip_probability" real NOT NULL, "fetched_at" TIMESTAMP WITH TIME ZONE NOT NULL, CONSTRAINT "PK_67b5fd8709098ce7e4a887c796c" PRIMARY KEY ("site_id", "time"))`);
        await queryRunner.query(`CREATE TABLE "notification" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "dedupe_key" text NOT NULL, "channel" text NOT NULL, "recipient" text NOT NULL, "sent_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_705b6c7cdf9b2c2ff7ac7872cb7" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_77259f38edc42fc28542f4e104" ON "notification"  ("firm_id", "dedupe_key") `);
        await queryRunner.query(`CREATE TABLE "weather_hold" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "crew_id" uuid, "dates" date array NOT NULL, "reason" text NOT NULL, "notes" text, "raised_by" uuid, "raised_from" text NOT NULL, "status" text NOT NULL DEFAULT 'open', "forecast_seen" jsonb NOT NULL DEFAULT '[]', "idempotency_key" text, "version" integer NOT NULL, "raised_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_ea2095b69b63080269fcd709839" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_a46203ea78c41f1a78c6315e79" ON "weather_hold"  ("firm_id", "idempotency_key") WHERE idempotency_key IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_0535d011b9325f9da54bb2d979" ON "weather_hold"  ("firm_id", "job_id") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_0535d011b9325f9da54bb2d979"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_a46203ea78c41f1a78c6315e79"`);
        await queryRunner.query(`DROP TABLE "weather_hold"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_77259f38edc42fc28542f4e104"`);
        await queryRunner.query(`DROP TABLE "notification"`);
        await queryRunner.query(`DROP TABLE "forecast_hour"`);
        await queryRunner.query(`DROP TABLE "forecast_fetch"`);
    }

}
