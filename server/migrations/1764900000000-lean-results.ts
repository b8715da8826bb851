import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Stored results no longer repeat the frequency grid and the nominal curves at the top level (`freqs`, `nominal`): the
 * same numbers are in `envelopes.freqs` and `envelopes.series[].nominal`. This removes the copies from stored rows.
 */
export class LeanResults1764900000000 implements MigrationInterface {
  name = "LeanResults1764900000000";

  async up(q: QueryRunner): Promise<void> {
    await q.query("UPDATE `run_result` SET `result` = JSON_REMOVE(`result`, '$.freqs') WHERE JSON_CONTAINS_PATH(`result`, 'one', '$.freqs')");
    await q.query("UPDATE `run_result` SET `result` = JSON_REMOVE(`result`, '$.nominal') WHERE JSON_CONTAINS_PATH(`result`, 'one', '$.nominal')");
  }

  async down(q: QueryRunner): Promise<void> {
    // The copies can be rebuilt from the envelopes when needed; nothing else reads them.
    await q.query("SELECT 1");
  }
}
