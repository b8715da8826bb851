import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Trust: a run remembers how often it was interrupted; a run's sweep is a real foreign key (runs that name a sweep
 * which does not exist lose the name); admin settings (cost limits) live in `app_setting`.
 */
export class Trust1764892800000 implements MigrationInterface {
  name = "Trust1764892800000";

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE \`run\` ADD \`interruptions\` int NOT NULL DEFAULT '0'`);
    await q.query(`ALTER TABLE \`run\` ADD \`last_interrupted_at\` datetime(3) NULL DEFAULT NULL`);
    await q.query(`UPDATE \`run\` SET \`sweep_id\` = NULL WHERE \`sweep_id\` IS NOT NULL AND \`sweep_id\` NOT IN (SELECT \`id\` FROM \`grade_sweep\`)`);
    await q.query(`ALTER TABLE \`run\` ADD CONSTRAINT \`FK_RUN_SWEEP\` FOREIGN KEY (\`sweep_id\`) REFERENCES \`grade_sweep\`(\`id\`) ON DELETE SET NULL ON UPDATE NO ACTION`);
    // A revision that has been sent for review is frozen from now on (earlier it stayed editable while in review).
    await q.query(`UPDATE \`design_revision\` SET \`locked\` = 1 WHERE \`review_state\` <> 'draft'`);
    await q.query(`CREATE TABLE \`app_setting\` (\`key\` varchar(64) NOT NULL, \`value\` json NOT NULL, \`updated_by_id\` varchar(255) NULL DEFAULT NULL, \`updated_at\` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (\`key\`)) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE \`app_setting\``);
    await q.query(`ALTER TABLE \`run\` DROP FOREIGN KEY \`FK_RUN_SWEEP\``);
    await q.query(`ALTER TABLE \`run\` DROP COLUMN \`last_interrupted_at\``);
    await q.query(`ALTER TABLE \`run\` DROP COLUMN \`interruptions\``);
  }
}
