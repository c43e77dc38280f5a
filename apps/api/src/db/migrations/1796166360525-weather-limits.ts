import { MigrationInterface, QueryRunner } from "typeorm";

export class WeatherLimits1796166360525 implements MigrationInterface {
    name = 'WeatherLimits1796166360525'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "firm_weather_limits" ("firm_id" uuid NOT NULL, "overrides" jsonb NOT NULL DEFAULT '{}', "updated_by" uuid, "version" integer NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_f04f79e90a0d3cdd9328a5715f9" PRIMARY KEY ("firm_id"))`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP TABLE "firm_weather_limits"`);
    }

}
