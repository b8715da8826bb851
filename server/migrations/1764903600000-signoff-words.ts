import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The review speaks hardware release practice now: in-review → awaiting-signoff, approved → signed-off,
 * changes-requested → returned (for rework). Stored states and the review trail are renamed in place.
 */
export class SignoffWords1764903600000 implements MigrationInterface {
  name = "SignoffWords1764903600000";

  async up(q: QueryRunner): Promise<void> {
    await this.rename(q, { "in-review": "awaiting-signoff", approved: "signed-off", "changes-requested": "returned" });
  }

  async down(q: QueryRunner): Promise<void> {
    await this.rename(q, { "awaiting-signoff": "in-review", "signed-off": "approved", returned: "changes-requested" });
  }

  private async rename(q: QueryRunner, map: Record<string, string>): Promise<void> {
    for (const [from, to] of Object.entries(map)) {
      await q.query("UPDATE `design_revision` SET `review_state` = ? WHERE `review_state` = ?", [to, from]);
      await q.query("UPDATE `review_event` SET `from_state` = ? WHERE `from_state` = ?", [to, from]);
      await q.query("UPDATE `review_event` SET `to_state` = ? WHERE `to_state` = ?", [to, from]);
    }
  }
}
