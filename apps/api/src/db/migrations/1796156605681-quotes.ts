import { MigrationInterface, QueryRunner } from "typeorm";

export class Quotes1796156605681 implements MigrationInterface {
    name = 'Quotes1796156605681'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "costing_settings" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "running_costs" jsonb NOT NULL, "working_days_per_month" double precision NOT NULL, "travel_mode" text NOT NULL, "travel_bands" jsonb NOT NULL, "travel_per_mile_pence" integer NOT NULL, "labour_rates" jsonb NOT NULL, "default_margin_pct" double precision NOT NULL, "vat_registered" boolean NOT NULL, "vat_rate_pct" double precision NOT NULL, "quote_validity_days" integer NOT NULL, "payment_terms" text NOT NULL, "deposit_pct" double precision NOT NULL, "default_waste_pct" double precision NOT NULL, "default_exclusions" text, "version" integer NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_2cf43b66a181dae7cf80a39f26b" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_67777dafcda43d8797707aa31d" ON "costing_settings"  ("firm_id") `);
        await queryRunner.query(`CREATE TABLE "quote" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "reference" text NOT NULL, "status" text NOT NULL DEFAULT 'draft', "current_version_id" uuid, "sent_to" text, "valid_until" date, "token_hash" text, "token_used_at" TIMESTAMP WITH TIME ZONE, "accepted_name" text, "accepted_at" TIMESTAMP WITH TIME ZONE, "accepted_ip" text, "declined_at" TIMESTAMP WITH TIME ZONE, "decline_reason" text, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_b772d4cb09e587c8c72a78d2439" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_4ba1efa97133e045200b3c709f" ON "quote"  ("token_hash") WHERE token_hash IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_38cccfdca47ce34995be3c12d6" ON "quote"  ("firm_id", "status") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_3f6e8a1eb1828e3a14be815294" ON "quote"  ("job_id") `);
        await queryRunner.query(`CREATE TABLE "deposit" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "quote_id" uuid NOT NULL, "amount_pence" integer NOT NULL, "status" text NOT NULL DEFAULT 'pending', "checkout_session_id" text, "payment_reference" text, "paid_at" TIMESTAMP WITH TIME ZONE, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_6654b4be449dadfd9d03a324b61" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_9bee239d9d58ec8b6c62c8b07c" ON "deposit"  ("quote_id") `);
        await queryRunner.query(`CREATE TABLE "job_actual" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "working_days" double precision, "weather_days_lost" double precision NOT NULL DEFAULT '0', "extra_access_weeks" integer NOT NULL DEFAULT '0', "extra_materials_pence" integer NOT NULL DEFAULT '0', "notes" text, "version" integer NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_ff7ed269048699569e9e55bbe42" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_a1d6493661c7c6ff66efa0d3ee" ON "job_actual"  ("job_id") `);
        await queryRunner.query(`CREATE TABLE "material" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "name" text NOT NULL, "name_key" text NOT NULL, "unit" text NOT NULL, "unit_price_pence" integer NOT NULL, "is_vatable" boolean NOT NULL DEFAULT true, "supplier" text, "version" integer NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_0343d0d577f3effc2054cbaca7f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_fc7e9abb5406a8e20eb4a12374" ON "material"  ("firm_id", "name_key") `);
        await queryRunner.query(`CREATE TABLE "quote_version" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "quote_id" uuid NOT NULL, "number" integer NOT NULL, "content" jsonb NOT NULL, "settings" jsonb NOT NULL, "breakdown" jsonb NOT NULL, "net_pence" integer NOT NULL, "gross_pence" integer NOT NULL, "deposit_pence" integer NOT NULL, "travel_per_day_pence" integer NOT NULL, "frozen_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_c43c48c852ccd172a80b352764b" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_622aa6d7b328e87d701af6b346" ON "quote_version"  ("quote_id", "number") `);
        await queryRunner.query(`ALTER TABLE "quote" ADD CONSTRAINT "FK_3f6e8a1eb1828e3a14be8152943" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "deposit" ADD CONSTRAINT "FK_9bee239d9d58ec8b6c62c8b07c6" FOREIGN KEY ("quote_id") REFERENCES "quote"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "job_actual" ADD CONSTRAINT "FK_a1d6493661c7c6ff66efa0d3eef" FOREIGN KEY ("job_id") REFERENCES "job"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "quote_version" ADD CONSTRAINT "FK_f351ab94a85bf09f785e6018c3b" FOREIGN KEY ("quote_id") REFERENCES "quote"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "quote_version" DROP CONSTRAINT "FK_f351ab94a85bf09f785e6018c3b"`);
        await queryRunner.query(`ALTER TABLE "job_actual" DROP CONSTRAINT "FK_a1d6493661c7c6ff66efa0d3eef"`);
        await queryRunner.query(`ALTER TABLE "deposit" DROP CONSTRAINT "FK_9bee239d9d58ec8b6c62c8b07c6"`);
        await queryRunner.query(`ALTER TABLE "quote" DROP CONSTRAINT "FK_3f6e8a1eb1828e3a14be8152943"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_622aa6d7b328e87d701af6b346"`);
        await queryRunner.query(`DROP TABLE "quote_version"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_fc7e9abb5406a8e20eb4a12374"`);
        await queryRunner.query(`DROP TABLE "material"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_a1d6493661c7c6ff66efa0d3ee"`);
        await queryRunner.query(`DROP TABLE "job_actual"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9bee239d9d58ec8b6c62c8b07c"`);
        await queryRunner.query(`DROP TABLE "deposit"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_3f6e8a1eb1828e3a14be815294"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_38cccfdca47ce34995be3c12d6"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_4ba1efa97133e045200b3c709f"`);
        await queryRunner.query(`DROP TABLE "quote"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_67777dafcda43d8797707aa31d"`);
        await queryRunner.query(`DROP TABLE "costing_settings"`);
    }

}
