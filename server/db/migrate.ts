import type { DataSource } from "typeorm";

/** Runs pending migrations (never `synchronize`), each in its own transaction. Returns their names. */
export async function migrate(ds: DataSource): Promise<string[]> {
  const done = await ds.runMigrations({ transaction: "each" });
  return done.map((m) => m.name);
}
