import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Sessions are stored by the SHA-256 of their cookie token from now on (server/auth/sessions.ts). Rows written before
 * held the cookie value itself, which no cookie can match any more: they are ended here, so everyone signs in once
 * again, and no readable cookie stays in the table.
 */
export class HashedSessions1764896400000 implements MigrationInterface {
  name = "HashedSessions1764896400000";

  async up(q: QueryRunner): Promise<void> {
    await q.query("DELETE FROM `auth_session`");
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query("DELETE FROM `auth_session`");
  }
}
