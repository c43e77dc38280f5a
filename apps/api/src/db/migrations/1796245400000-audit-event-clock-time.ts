import { MigrationInterface, QueryRunner } from "typeorm";

/**
 * An audit event's time is the moment it is written, not the start of its transaction: a move, the access that
 * follows it and the seed's many steps then read in the order they happened instead of tying.
 */
export class AuditEventClockTime1796245400000 implements MigrationInterface {
    name = 'AuditEventClockTime1796245400000'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "audit_event" ALTER COLUMN "at" SET DEFAULT clock_timestamp()`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "audit_event" ALTER COLUMN "at" SET DEFAULT now()`);
    }
}
