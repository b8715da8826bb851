import "reflect-metadata";
import { DataSource } from "typeorm";
import type { ServerConfig } from "../config/env";
import { entities } from "../entities";
import { migrations } from "../migrations";

/** The TypeORM DataSource for a database; schema changes go through migrations only, never `synchronize`. */
export function createDataSource(db: ServerConfig["db"], options: { poolSize?: number } = {}): DataSource {
  return new DataSource({
    type: "mariadb",
    host: db.host,
    port: db.port,
    username: db.user,
    password: db.password,
    database: db.name,
    timezone: "Z",
    charset: "utf8mb4_unicode_ci",
    entities,
    migrations,
    migrationsRun: false,
    synchronize: false,
    poolSize: options.poolSize ?? 10,
    logging: ["error"],
  });
}

/** Opens the DataSource and applies pending migrations; returns how many ran. */
export async function openAndMigrate(dataSource: DataSource): Promise<number> {
  if (!dataSource.isInitialized) await dataSource.initialize();
  const ran = await dataSource.runMigrations({ transaction: "each" });
  return ran.length;
}
