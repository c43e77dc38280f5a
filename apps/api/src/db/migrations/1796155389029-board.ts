import { MigrationInterface, QueryRunner } from "typeorm";

export class Board1796155389029 implements MigrationInterface {
    name = 'Board1796155389029'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "assignment" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "crew_id" uuid NOT NULL, "start_date" date NOT NULL, "working_days" integer NOT NULL, "days" date array NOT NULL, "end_date" date NOT NULL, "updated_by" uuid, "version" integer NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "REL_e2262a906a37770a56a1a7168d" UNIQUE ("job_id"), CONSTRAINT "PK_43c2f5a3859f54cedafb270f37e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_e2262a906a37770a56a1a7168d" ON "assignment"  ("job_id") `);
        await queryRunner.query(`CREATE INDEX "IDX_4ef8f60cdc7dc48e98f2288b9c" ON "assignment"  ("firm_id", "end_date") `);
        await queryRunner.query(`CREATE INDEX "IDX_15849a71fd47e4c341232e99c4" ON "assignment"  ("firm_id", "crew_id", "start_date") `);
        await queryRunner.query(`CREATE TABLE "schedule_event" ("id" BIGSERIAL NOT NULL, "firm_id" uuid NOT NULL, "crew_ids" uuid array NOT NULL, "type" text NOT NULL, "payload" jsonb NOT NULL, "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_d658c2629387690dca1f793d410" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_31a52f7ffa482119a6323daa63" ON "schedule_event"  ("firm_id", "id") `);
        await queryRunner.query(`CREATE TABLE "time_off" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "scope" text NOT NULL, "crew_id" uuid, "member_id" uuid, "label" text NOT NULL, "start_date" date NOT NULL, "end_date" date NOT NULL, "repeats" text NOT NULL DEFAULT 'none', "repeat_until" date, "notes" text, "rule" text NOT NULL, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_e80a790cc96026d0f557a78f83d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_202a531502539cce4647812667" ON "time_off"  ("firm_id", "scope") `);
        await queryRunner.query(`ALTER TABLE "assignment" ADD CONSTRAINT "FK_e2262a906a37770a56a1a7168d4" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "assignment" ADD CONSTRAINT "FK_101ac82dbe4004972ef73fccf27" FOREIGN KEY ("crew_id") REFERENCES "crew"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "assignment" DROP CONSTRAINT "FK_101ac82dbe4004972ef73fccf27"`);
        await queryRunner.query(`ALTER TABLE "assignment" DROP CONSTRAINT "FK_e2262a906a37770a56a1a7168d4"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_202a531502539cce4647812667"`);
        await queryRunner.query(`DROP TABLE "time_off"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_31a52f7ffa482119a6323daa63"`);
        await queryRunner.query(`DROP TABLE "schedule_event"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_15849a71fd47e4c341232e99c4"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_4ef8f60cdc7dc48e98f2288b9c"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_e2262a906a37770a56a1a7168d"`);
        await queryRunner.query(`DROP TABLE "assignment"`);
    }

}
