import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Two read paths measured in docs/benchmarks.md:
 * - the primary key also carries value and quality, so chart and nearest-reading queries are index-only
 *   scans instead of one heap page per reading (ingest interleaves every probe's rows in time order);
 * - a partial index on suspect readings, so probe-health spike checks stop reading every reading of the day.
 */
export class ReadingIndexes1796180000000 implements MigrationInterface {
  name = 'ReadingIndexes1796180000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "readings" DROP CONSTRAINT "pk_readings"`);
    await queryRunner.query(`ALTER TABLE "readings" ADD CONSTRAINT "pk_readings" PRIMARY KEY ("probe_id", "quantity", "at") INCLUDE ("value", "quality")`);
    await queryRunner.query(`CREATE INDEX "ix_readings_suspect" ON "readings" ("probe_id", "quantity", "at") WHERE "quality" = 'suspect'`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "ix_readings_suspect"`);
    await queryRunner.query(`ALTER TABLE "readings" DROP CONSTRAINT "pk_readings"`);
    await queryRunner.query(`ALTER TABLE "readings" ADD CONSTRAINT "pk_readings" PRIMARY KEY ("probe_id", "quantity", "at")`);
  }
}
