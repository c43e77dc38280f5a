import { MigrationInterface, QueryRunner } from "typeorm";

export class Init1796154711035 implements MigrationInterface {
    name = 'Init1796154711035'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "audit_event" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "actor_user_id" uuid, "entity" text NOT NULL, "entity_id" uuid NOT NULL, "action" text NOT NULL, "before" jsonb, "after" jsonb, "at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_481efbe8b0a403efe3f47a6528f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_f9581209c89d7dfc43c988b9e7" ON "audit_event"  ("firm_id", "entity", "entity_id") `);
        await queryRunner.query(`CREATE TABLE "auth_token" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "kind" text NOT NULL, "token_hash" text NOT NULL, "user_id" uuid NOT NULL, "membership_id" uuid, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "used_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_4572ff5d1264c4a523f01aa86a0" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_bf636362c6d210728e4539630b" ON "auth_token"  ("token_hash") `);
        await queryRunner.query(`CREATE TABLE "client" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "name" text NOT NULL, "contact_name" text, "email" text, "phone" text, "notes" text, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_96da49381769303a6515a8785c7" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_d58a6573f22e5c1fedf5a6c135" ON "client"  ("firm_id", "name") `);
        await queryRunner.query(`CREATE TABLE "firm" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "name" text NOT NULL, "email" text, "phone" text, "address" text, "time_zone" text NOT NULL DEFAULT 'Europe/London', "holiday_region" text NOT NULL DEFAULT 'GB-ENG', "working_weekdays" integer array NOT NULL DEFAULT '{1,2,3,4,5}', "day_start" text NOT NULL DEFAULT '08:00', "day_end" text NOT NULL DEFAULT '16:30', "closures" date array NOT NULL DEFAULT '{}', "job_sequence" integer NOT NULL DEFAULT '0', "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_b6e197d72a2ef8bd97a7cbc686e" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "app_user" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "email" text NOT NULL, "name" text NOT NULL, "password_hash" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_3fa909d0e37c531ebc237703391" UNIQUE ("email"), CONSTRAINT "PK_22a5c4a3d9b2fb8e4e73fc4ada1" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE TABLE "membership" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "user_id" uuid NOT NULL, "role" text NOT NULL, "status" text NOT NULL DEFAULT 'active', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_83c1afebef3059472e7c37e8de8" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_6a0c151af5d68f2ab8e8dc787b" ON "membership"  ("firm_id", "user_id") `);
        await queryRunner.query(`CREATE TABLE "crew_member" ("crew_id" uuid NOT NULL, "member_id" uuid NOT NULL, "firm_id" uuid NOT NULL, CONSTRAINT "PK_7c134abb049cdb5cc8eab03e193" PRIMARY KEY ("crew_id", "member_id"))`);
        await queryRunner.query(`CREATE TABLE "crew" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "name" text NOT NULL, "colour" text NOT NULL, "lead_member_id" uuid, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_cc72b429996b3476dbaac59f1c2" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_adfedf7abe0bfe2528990f2190" ON "crew"  ("firm_id", "name") `);
        await queryRunner.query(`CREATE TABLE "site" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "client_id" uuid NOT NULL, "address_line1" text NOT NULL, "address_line2" text, "town" text NOT NULL, "postcode" text NOT NULL, "access_notes" text, "hazards" text, "lat" double precision, "lon" double precision, "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_635c0eeabda8862d5b0237b42b4" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_f045481e25c168ab536c5df1d1" ON "site"  ("firm_id", "postcode") `);
        await queryRunner.query(`CREATE TABLE "job" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "firm_id" uuid NOT NULL, "reference" text NOT NULL, "client_id" uuid NOT NULL, "site_id" uuid NOT NULL, "title" text NOT NULL, "description" text, "work_types" text array NOT NULL, "estimated_working_days" integer NOT NULL, "access_needs" text array NOT NULL DEFAULT '{}', "earliest_start" date, "target_finish" date, "priority" text NOT NULL DEFAULT 'normal', "site_notes" text, "status" text NOT NULL DEFAULT 'enquiry', "version" integer NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_98ab1c14ff8d1cf80d18703b92f" PRIMARY KEY ("id"))`);
        await queryRunner.query(`CREATE INDEX "IDX_c0fe57d22e8d8cadc2733f51a8" ON "job"  ("firm_id", "status") `);
        await queryRunner.query(`CREATE UNIQUE INDEX "IDX_23baaacca0ee9c91aa07db2537" ON "job"  ("firm_id", "reference") `);
        await queryRunner.query(`ALTER TABLE "membership" ADD CONSTRAINT "FK_e0f72ed69c72f8f1f3d481a8f84" FOREIGN KEY ("firm_id") REFERENCES "firm"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "membership" ADD CONSTRAINT "FK_e9c72e8d29784031c96f5c6af8d" FOREIGN KEY ("user_id") REFERENCES "app_user"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "crew_member" ADD CONSTRAINT "FK_fe25c1b4ed25ca7c744d7dfde16" FOREIGN KEY ("crew_id") REFERENCES "crew"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "crew_member" ADD CONSTRAINT "FK_26e24d1d0f4a45f607e3cc3bc0c" FOREIGN KEY ("member_id") REFERENCES "membership"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "crew" ADD CONSTRAINT "FK_fa803a94678f25d726e36f29b9c" FOREIGN KEY ("lead_member_id") REFERENCES "membership"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "site" ADD CONSTRAINT "FK_4c92eeb1ab02022d70cca47b490" FOREIGN KEY ("client_id") REFERENCES "client"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "job" ADD CONSTRAINT "FK_cc52bb1d22b93ebd7d86a88da4d" FOREIGN KEY ("client_id") REFERENCES "client"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
        await queryRunner.query(`ALTER TABLE "job" ADD CONSTRAINT "FK_fec9499acd961963befccb3a17c" FOREIGN KEY ("site_id") REFERENCES "site"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "job" DROP CONSTRAINT "FK_fec9499acd961963befccb3a17c"`);
        await queryRunner.query(`ALTER TABLE "job" DROP CONSTRAINT "FK_cc52bb1d22b93ebd7d86a88da4d"`);
        await queryRunner.query(`ALTER TABLE "site" DROP CONSTRAINT "FK_4c92eeb1ab02022d70cca47b490"`);
        await queryRunner.query(`ALTER TABLE "crew" DROP CONSTRAINT "FK_fa803a94678f25d726e36f29b9c"`);
        await queryRunner.query(`ALTER TABLE "crew_member" DROP CONSTRAINT "FK_26e24d1d0f4a45f607e3cc3bc0c"`);
        await queryRunner.query(`ALTER TABLE "crew_member" DROP CONSTRAINT "FK_fe25c1b4ed25ca7c744d7dfde16"`);
        await queryRunner.query(`ALTER TABLE "membership" DROP CONSTRAINT "FK_e9c72e8d29784031c96f5c6af8d"`);
        await queryRunner.query(`ALTER TABLE "membership" DROP CONSTRAINT "FK_e0f72ed69c72f8f1f3d481a8f84"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_23baaacca0ee9c91aa07db2537"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_c0fe57d22e8d8cadc2733f51a8"`);
        await queryRunner.query(`DROP TABLE "job"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f045481e25c168ab536c5df1d1"`);
        await queryRunner.query(`DROP TABLE "site"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_adfedf7abe0bfe2528990f2190"`);
        await queryRunner.query(`DROP TABLE "crew"`);
        await queryRunner.query(`DROP TABLE "crew_member"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_6a0c151af5d68f2ab8e8dc787b"`);
        await queryRunner.query(`DROP TABLE "membership"`);
        await queryRunner.query(`DROP TABLE "app_user"`);
        await queryRunner.query(`DROP TABLE "firm"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_d58a6573f22e5c1fedf5a6c135"`);
        await queryRunner.query(`DROP TABLE "client"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_bf636362c6d210728e4539630b"`);
        await queryRunner.query(`DROP TABLE "auth_token"`);
        await queryRunner.query(`DROP INDEX "public"."IDX_f9581209c89d7dfc43c988b9e7"`);
        await queryRunner.query(`DROP TABLE "audit_event"`);
    }

}
