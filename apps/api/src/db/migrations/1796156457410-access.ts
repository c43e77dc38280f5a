import { MigrationInterface, QueryRunner } from "typeorm";

export class Access1796156457410 implements MigrationInterface {
    name = 'Access1796156457410'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "supplier" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "name" text NOT NULL, "contact_name" text, "email" text, "phone" text, "lead_time_working_days" integer NOT NULL DEFAULT '3', "minimum_weeks" integer NOT NULL DEFAULT '1', "weekly_rates" jsonb NOT NULL DEFAULT '{}', "version" integer NOT NULL, CONSTRAINT "PK_2bc0d2cab6276144d2ff98a2828" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_023e05c6cbcc5f213e0efe5d0a" ON "supplier"  ("firm_id", "name") `);
        await queryRunner.query(`CREATE TABLE "access_booking" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_ids" uuid array NOT NULL, "access_type" text NOT NULL, "supplier_id" uuid NOT NULL, "state" text NOT NULL DEFAULT 'requested', "requested_erect" date, "requested_strike" date, "confirmed_erect" date, "confirmed_strike" date, "erected_on" date, "struck_on" date, "weekly_rate" integer NOT NULL, "minimum_weeks" integer NOT NULL, "priced_weeks" integer, "curing_days" integer NOT NULL DEFAULT '0', "reference" text, "notes" text, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_4ecc5ba6527485c411e7925b4d5" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_07225ea32789c27bbd9f30b78a" ON "access_booking"  ("firm_id", "state") `);
        await queryRunner.query(`CREATE TABLE "access_change_request" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "booking_id" uuid NOT NULL, "status" text NOT NULL DEFAULT 'pending', "old_erect" date, "old_strike" date, "new_erect" date NOT NULL, "new_strike" date NOT NULL, "counter_erect" date, "counter_strike" date, "supplier_note" text, "token_hash" text NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "answered_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_894a072042bb4ff5cd3bd4b702d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_fa71d8dfa4878746a7f26c638b" ON "access_change_request"  ("token_hash") `);
        await queryRunner.query(`CREATE INDEX "IDX_51f051b301483e11ff6700abad" ON "access_change_request"  ("firm_id", "booking_id") `);
        await queryRunner.query(`CREATE TABLE "scaffold_inspection" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "booking_id" uuid NOT NULL, "inspected_at" TIMESTAMP WITH TIME ZONE NOT NULL, "inspected_on" date NOT NULL, "inspector_name" text NOT NULL, "result" text NOT NULL, "defects" text, "notes" text, "recorded_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_ac921b3a9d5531c6e90e315bc93" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_8a9827b96cee048b1d911f4c85" ON "scaffold_inspection"  ("firm_id", "booking_id", "inspected_at") `);
        await queryRunner.query(`CREATE INDEX "idx_access_booking_job_ids" ON "access_booking" USING GIN ("job_ids")`);
        await queryRunner.query(`ALTER TABLE "access_booking" ADD CONSTRAINT "FK_ad6af64c194ff076023b1228f29" FOREIGN KEY ("supplier_id") REFERENCES "supplier"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."idx_access_booking_job_ids"`);
        await queryRunner.query(`ALTER TABLE "access_booking" DROP CONSTRAINT "FK_ad6af64c194ff076023b1228f29"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_8a9827b96cee048b1d911f4c85"`);
        await queryRunner.query(`DROP TABLE "scaffold_inspection"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_51f051b301483e11ff6700abad"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_fa71d8dfa4878746a7f26c638b"`);
        await queryRunner.query(`DROP TABLE "access_change_request"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_07225ea32789c27bbd9f30b78a"`);
        await queryRunner.query(`DROP TABLE "access_booking"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_023e05c6cbcc5f213e0efe5d0a"`);
        await queryRunner.query(`DROP TABLE "supplier"`);
    }

}
