import mysql from "mysql2/promise";
import { describe, expect, it } from "vitest";
import { loadConfig } from "../../server/config/env";
import { createDataSource, openAndMigrate } from "../../server/db/data-source";
import { migrations } from "../../server/migrations";

describe("migrations", () => {
  it("run on an empty database, leave the entities with nothing to synchronize, and a second run applies nothing", async () => {
    if (!process.env.LOTWISE_TEST_DB_READY) throw new Error("run through `npm test`");
    const base = loadConfig(process.env).db;
    const name = `lotwise_schema_${process.pid}`;
    const root = await mysql.createConnection({ host: base.host, port: base.port, user: base.user, password: base.password });
    await root.query(`DROP DATABASE IF EXISTS \`${name}\``);
    await root.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    const ds = createDataSource({ ...base, name });
    try {
      expect(await openAndMigrate(ds)).toBe(migrations.length);
      const pending = await ds.driver.createSchemaBuilder().log();
      expect(pending.upQueries.map((q) => String(q.query))).toStrictEqual([]);
      expect(await openAndMigrate(ds)).toBe(0);
    } finally {
      await ds.destroy();
      await root.query(`DROP DATABASE \`${name}\``);
      await root.end();
    }
  });
});
