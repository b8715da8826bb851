// Prints the SQL that would bring a database migrated with today's migrations in line with today's entities — the body
// of the next hand-written migration. Uses the test MariaDB (.tmp/mariadb-test, port 3308) and a scratch database.
// Run: npx tsx scripts/migration-sql.ts
import mysql from "mysql2/promise";
import { createDataSource, openAndMigrate } from "../server/db/data-source";
import { ensureDatabase, startMariaDb } from "./mariadb";

const creds = { host: "127.0.0.1", port: 3308, user: "lotwise_test", password: "lotwise-test-db", name: "lotwise_migration_sql" };
const db = await startMariaDb({ dir: ".tmp/mariadb-test", port: creds.port });
try {
  ensureDatabase(db, { ...creds, everything: true });
  const root = await mysql.createConnection({ host: creds.host, port: creds.port, user: creds.user, password: creds.password });
  await root.query(`DROP DATABASE IF EXISTS ${creds.name}`);
  await root.query(`CREATE DATABASE ${creds.name} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  const ds = createDataSource(creds);
  await openAndMigrate(ds);
  const log = await ds.driver.createSchemaBuilder().log();
  for (const q of log.upQueries) console.log(`${String(q.query)};`);
  if (log.upQueries.length === 0) console.log("-- entities and migrations agree: nothing to add");
  await ds.destroy();
  await root.query(`DROP DATABASE ${creds.name}`);
  await root.end();
} finally {
  await db.stop();
}
