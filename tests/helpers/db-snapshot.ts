import type { DataSource } from "typeorm";

/**
 * A fingerprint of every table of a test database: its row count and MariaDB's `CHECKSUM TABLE` (a checksum over
 * every row's contents), so a test can assert that a rejected request left the database exactly as it was —
 * not only as many rows, but the same rows with the same values.
 */
export interface DbSnapshot {
  /** table name → { rows, checksum } */
  readonly tables: Readonly<Record<string, { rows: number; checksum: string }>>;
}

export interface SnapshotOptions {
  /**
   * Tables to leave out, for rows the app writes on its own schedule rather than because of the request under test
   * (e.g. `outbox_message`, which the mail stand-in fills asynchronously). Default: none.
   */
  exclude?: readonly string[];
}

const quote = (name: string) => `\`${name.replace(/`/g, "``")}\``;

/** Every base table of the data source's current database, sorted by name. */
export async function listTables(dataSource: DataSource): Promise<string[]> {
  const rows: { name: string }[] = await dataSource.query(
    "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name",
  );
  return rows.map((r) => r.name);
}

/** Row count and contents checksum of every table (two queries, whatever the number of tables). */
export async function snapshotDb(dataSource: DataSource, options: SnapshotOptions = {}): Promise<DbSnapshot> {
  const exclude = new Set(options.exclude ?? []);
  const tables = (await listTables(dataSource)).filter((t) => !exclude.has(t));
  if (tables.length === 0) return { tables: {} };
  const counts: { t: string; n: number | string }[] = await dataSource.query(
    tables.map((t) => `SELECT ? AS t, COUNT(*) AS n FROM ${quote(t)}`).join(" UNION ALL "),
    tables,
  );
  const sums: { Table: string; Checksum: number | string | null }[] = await dataSource.query(`CHECKSUM TABLE ${tables.map(quote).join(", ")}`);
  const checksum = new Map(sums.map((s) => [s.Table.slice(s.Table.indexOf(".") + 1), String(s.Checksum)]));
  const out: Record<string, { rows: number; checksum: string }> = {};
  for (const c of counts) out[c.t] = { rows: Number(c.n), checksum: checksum.get(c.t) ?? "missing" };
  return { tables: out };
}

/** What differs between two snapshots, one line per table ("run: rows 3 → 4, checksum 123 → 456"); empty when equal. */
export function diffSnapshots(before: DbSnapshot, after: DbSnapshot): string[] {
  const names = [...new Set([...Object.keys(before.tables), ...Object.keys(after.tables)])].sort();
  const out: string[] = [];
  for (const name of names) {
    const a = before.tables[name];
    const b = after.tables[name];
    if (!a || !b) out.push(`${name}: ${a ? "dropped" : "appeared"}`);
    else if (a.rows !== b.rows || a.checksum !== b.checksum) out.push(`${name}: rows ${a.rows} → ${b.rows}, checksum ${a.checksum} → ${b.checksum}`);
  }
  return out;
}
