import { MigrationInterface, QueryRunner } from "typeorm";

export class CrewPhone1796157002046 implements MigrationInterface {
    name = 'CrewPhone1796157002046'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "calendar_feed" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "user_id" uuid NOT NULL, "token_hash" text NOT NULL, "revoked_at" TIMESTAMP WITH TIME ZONE, "last_fetched_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_24c0b9c80e4a4ac8752d854bc2e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_3a0b1d1c7619ea19ff1affaaf7" ON "calendar_feed"  ("token_hash") `);
        await queryRunner.query(`CREATE INDEX "IDX_9f8d011c2e6c7efe477e15217d" ON "calendar_feed"  ("firm_id", "user_id") `);
        await queryRunner.query(`CREATE TABLE "photo" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "caption" text, "content_type" text NOT NULL, "size_bytes" integer NOT NULL, "width" integer NOT NULL, "height" integer NOT NULL, "taken_at" TIMESTAMP WITH TIME ZONE, "original_key" text NOT NULL, "thumb_key" text NOT NULL, "is_location_removed" boolean NOT NULL, "uploaded_by" uuid, "idempotency_key" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_723fa50bf70dcfd06fb5a44d4ff" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_9179bcce88e3e8bca5d5e3c15d" ON "photo"  ("firm_id", "idempotency_key") WHERE idempotency_key IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_7060b38bb7142c0eeac36d0d14" ON "photo"  ("firm_id", "job_id", "created_at") `);
        await queryRunner.query(`CREATE TABLE "photo_settings" ("firm_id" uuid NOT NULL, "remove_location" boolean NOT NULL DEFAULT true, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_4a13ea8545234bd66ec1ed73892" PRIMARY KEY ("firm_id"))`);
        await queryRunner.query(`CREATE TABLE "push_subscription" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "user_id" uuid NOT NULL, "endpoint" text NOT NULL, "p256dh" text NOT NULL, "auth" text NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_07fc861c0d2c38c1b830fb9cb5d" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_27ae9074fc39a09bc1aee263df" ON "push_subscription"  ("endpoint") `);
        await queryRunner.query(`CREATE INDEX "IDX_5dc9bf5f051cfdcd4f2f70fc43" ON "push_subscription"  ("firm_id", "user_id") `);
        await queryRunner.query(`CREATE TABLE "site_note" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "job_id" uuid NOT NULL, "body" text NOT NULL, "author_user_id" uuid, "author_role" text NOT NULL, "idempotency_key" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_7f35d3c8091f4fe0f76be15c5a9" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_c1426fc925d1bd70beb47c1adb" ON "site_note"  ("firm_id", "idempotency_key") WHERE idempotency_key IS NOT NULL`);
        await queryRunner.query(`CREATE INDEX "IDX_357874b39c36c2fb0ae99c7ba7" ON "site_note"  ("firm_id", "job_id", "created_at") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "public"."IDX_357874b39c36c2fb0ae99c7ba7"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c1426fc925d1bd70beb47c1adb"`);
        await queryRunner.query(`DROP TABLE "site_note"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_5dc9bf5f051cfdcd4f2f70fc43"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_27ae9074fc39a09bc1aee263df"`);
        await queryRunner.query(`DROP TABLE "push_subscription"`);
        await queryRunner.query(`DROP TABLE "photo_settings"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_7060b38bb7142c0eeac36d0d14"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9179bcce88e3e8bca5d5e3c15d"`);
        await queryRunner.query(`DROP TABLE "photo"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_9f8d011c2e6c7efe477e15217d"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_3a0b1d1c7619ea19ff1affaaf7"`);
        await queryRunner.query(`DROP TABLE "calendar_feed"`);
    }

}
