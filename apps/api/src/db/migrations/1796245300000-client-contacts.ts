import { MigrationInterface, QueryRunner } from "typeorm";

/** A client's one contact (name, e-mail, phone columns) becomes the first entry of a list of contacts. */
export class ClientContacts1796245300000 implements MigrationInterface {
    name = 'ClientContacts1796245300000'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "client" ADD "contacts" jsonb NOT NULL DEFAULT '[]'`);
        await queryRunner.query(`
            UPDATE "client"
               SET "contacts" = jsonb_build_array(jsonb_build_object(
                     'name', NULLIF(btrim("contact_name"), ''),
                     'role', NULL,
                     'email', NULLIF(btrim("email"), ''),
                     'phone', NULLIF(btrim("phone"), '')))
             WHERE COALESCE(NULLIF(btrim("contact_name"), ''), NULLIF(btrim("email"), ''), NULLIF(btrim("phone"), '')) IS NOT NULL`);
        await queryRunner.query(`ALTER TABLE "client" DROP COLUMN "contact_name"`);
        await queryRunner.query(`ALTER TABLE "client" DROP COLUMN "email"`);
        await queryRunner.query(`ALTER TABLE "client" DROP COLUMN "phone"`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "client" ADD "contact_name" text`);
        await queryRunner.query(`ALTER TABLE "client" ADD "email" text`);
        await queryRunner.query(`ALTER TABLE "client" ADD "phone" text`);
        // Only the main contact fits the old columns; the others are lost.
        await queryRunner.query(`
            UPDATE "client"
               SET "contact_name" = "contacts"->0->>'name',
                   "email" = "contacts"->0->>'email',
                   "phone" = "contacts"->0->>'phone'`);
        await queryRunner.query(`ALTER TABLE "client" DROP COLUMN "contacts"`);
    }

}
