import type { MigrationInterface, QueryRunner } from "typeorm";

/** People, sessions, invitations, password resets and the local outbox. */
export class Foundation1764633600000 implements MigrationInterface {
  name = "Foundation1764633600000";

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE auth_user (
      id varchar(255) NOT NULL,
      email varchar(254) NOT NULL,
      name varchar(120) NOT NULL,
      password_hash varchar(255) NOT NULL,
      roles longtext NOT NULL CHECK (json_valid(roles)),
      active tinyint NOT NULL DEFAULT 1,
      created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      updated_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3),
      UNIQUE INDEX IDX_AUTH_USER_EMAIL (email),
      PRIMARY KEY (id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
    await q.query(`CREATE TABLE auth_session (
      id varchar(255) NOT NULL,
      user_id varchar(255) NOT NULL,
      expires_at datetime NOT NULL,
      INDEX IDX_AUTH_SESSION_USER (user_id),
      PRIMARY KEY (id),
      CONSTRAINT FK_AUTH_SESSION_USER FOREIGN KEY (user_id) REFERENCES auth_user (id) ON DELETE CASCADE ON UPDATE NO ACTION
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
    await q.query(`CREATE TABLE invitation (
      id char(36) NOT NULL,
      email varchar(254) NOT NULL,
      roles longtext NOT NULL CHECK (json_valid(roles)),
      token_hash char(64) NOT NULL,
      invited_by_id varchar(255) NOT NULL,
      created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      expires_at datetime(3) NOT NULL,
      accepted_at datetime(3) NULL DEFAULT NULL,
      revoked_at datetime(3) NULL DEFAULT NULL,
      UNIQUE INDEX IDX_INVITATION_TOKEN (token_hash),
      INDEX IDX_INVITATION_EMAIL (email),
      PRIMARY KEY (id),
      CONSTRAINT FK_INVITATION_INVITED_BY FOREIGN KEY (invited_by_id) REFERENCES auth_user (id) ON DELETE CASCADE ON UPDATE NO ACTION
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
    await q.query(`CREATE TABLE password_reset (
      id char(36) NOT NULL,
      user_id varchar(255) NOT NULL,
      token_hash char(64) NOT NULL,
      created_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      expires_at datetime(3) NOT NULL,
      used_at datetime(3) NULL DEFAULT NULL,
      UNIQUE INDEX IDX_PASSWORD_RESET_TOKEN (token_hash),
      PRIMARY KEY (id),
      CONSTRAINT FK_PASSWORD_RESET_USER FOREIGN KEY (user_id) REFERENCES auth_user (id) ON DELETE CASCADE ON UPDATE NO ACTION
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
    await q.query(`CREATE TABLE outbox_message (
      id char(36) NOT NULL,
      from_address varchar(320) NOT NULL,
      to_addresses longtext NOT NULL CHECK (json_valid(to_addresses)),
      subject varchar(500) NOT NULL,
      text_body mediumtext NOT NULL,
      received_at datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      INDEX IDX_OUTBOX_RECEIVED (received_at),
      PRIMARY KEY (id)
    ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ["outbox_message", "password_reset", "invitation", "auth_session", "auth_user"]) {
      await q.query(`DROP TABLE ${table}`);
    }
  }
}
