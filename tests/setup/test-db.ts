import { randomBytes } from "node:crypto";
import mysql from "mysql2/promise";
import type { DataSource } from "typeorm";
import { createDataSource, type DbSettings } from "../../server/db/data-source";
import { migrate } from "../../server/db/migrate";

/** The admin connection `npm test` set up (see server/infra/bootstrap.mjs). */
export function adminSettings(): Omit<DbSettings, "database"> {
  const { DB_HOST, DB_PORT, DB_ADMIN_USER, DB_ADMIN_PASSWORD } = process.env;
  if (!DB_PORT || !DB_ADMIN_USER) {
    throw new Error(
      "These tests need the MariaDB that `npm test` starts. Run them with `npm test` (extra args go to vitest).",
    );
  }
  return {
    host: DB_HOST ?? "127.0.0.1",
    port: Number(DB_PORT),
    user: DB_ADMIN_USER,
    password: DB_ADMIN_PASSWORD ?? "",
  };
}

export interface TestDatabase {
  ds: DataSource;
  settings: DbSettings;
  drop(): Promise<void>;
}

/** A fresh, migrated database for one test file; `drop()` removes it. */
export async function createTestDatabase(): Promise<TestDatabase> {
  const admin = adminSettings();
  const database = `sitecue_t_${randomBytes(6).toString("hex")}`;
  const conn = await mysql.createConnection(admin);
  await conn.query(
    `CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
  );
  await conn.end();
  const settings = { ...admin, database };
  const ds = createDataSource(settings);
  await ds.initialize();
  await migrate(ds);
  return {
    ds,
    settings,
    async drop() {
      if (ds.isInitialized) await ds.destroy();
      const c = await mysql.createConnection(admin);
      await c.query(`DROP DATABASE IF EXISTS \`${database}\``);
      await c.end();
    },
  };
}
