import mysql from "mysql2/promise";
import { afterAll, beforeAll, expect, it } from "vitest";
import { createDataSource } from "./data-source";
import {
  adminSettings,
  createTestDatabase,
  type TestDatabase,
} from "../../tests/setup/test-db";

let migrated: TestDatabase;
let synced: TestDatabase;

beforeAll(async () => {
  migrated = await createTestDatabase();
  // A second database built by TypeORM's synchronize straight from the entities (tests only).
  synced = await createTestDatabase();
  for (let i = 0; i < synced.ds.migrations.length; i++)
    await synced.ds.undoLastMigration({ transaction: "each" });
  await synced.ds.query("DROP TABLE IF EXISTS `migrations`");
  await synced.ds.synchronize();
}, 60_000);
afterAll(async () => {
  await migrated?.drop();
  await synced?.drop();
});

/**
 * Columns, indexes and foreign keys of a database, as information_schema reports them. Tables
 * owned by libraries (sessions: express-mysql-session; rate_limits: rate-limiter-flexible) have
 * no entity, so they are left out.
 */
async function describe(database: string) {
  const conn = await mysql.createConnection({
    ...adminSettings(),
    database: "information_schema",
  });
  try {
    const [columns] = await conn.query(
      "SELECT TABLE_NAME t, COLUMN_NAME c, COLUMN_TYPE type, IS_NULLABLE n, COLUMN_DEFAULT d, EXTRA e FROM COLUMNS WHERE TABLE_SCHEMA = ? AND TABLE_NAME NOT IN ('migrations','sessions','rate_limits') ORDER BY t, c",
      [database],
    );
    const [indexes] = await conn.query(
      "SELECT TABLE_NAME t, INDEX_NAME i, NON_UNIQUE u, GROUP_CONCAT(COLUMN_NAME ORDER BY SEQ_IN_INDEX) cols FROM STATISTICS WHERE TABLE_SCHEMA = ? AND TABLE_NAME NOT IN ('migrations','sessions','rate_limits') GROUP BY t, i, u ORDER BY t, cols, u",
      [database],
    );
    const [fks] = await conn.query(
      "SELECT k.TABLE_NAME t, k.COLUMN_NAME c, k.REFERENCED_TABLE_NAME rt, r.DELETE_RULE d FROM KEY_COLUMN_USAGE k JOIN REFERENTIAL_CONSTRAINTS r ON r.CONSTRAINT_SCHEMA = k.TABLE_SCHEMA AND r.CONSTRAINT_NAME = k.CONSTRAINT_NAME WHERE k.TABLE_SCHEMA = ? ORDER BY t, c",
      [database],
    );
    // Index names made up by TypeORM for FKs differ by nothing but name; compare by columns.
    return {
      columns,
      indexes: (indexes as { i: string }[]).map(({ i, ...rest }) => ({
        ...rest,
        named: i.startsWith("FK_") || i.startsWith("IDX_") ? "(generated)" : i,
      })),
      fks,
    };
  } finally {
    await conn.end();
  }
}

it("the migrations build the same schema as the entities describe", async () => {
  const a = await describe(migrated.settings.database);
  const b = await describe(synced.settings.database);
  expect((a.columns as unknown[]).length).toBeGreaterThan(50);
  expect(a.columns).toEqual(b.columns);
  expect(a.indexes).toEqual(b.indexes);
  expect(a.fks).toEqual(b.fks);
});

it("undoing and redoing the migrations works", async () => {
  const ds = createDataSource(migrated.settings);
  await ds.initialize();
  try {
    const before = await ds.query("SHOW TABLES");
    for (let i = 0; i < ds.migrations.length; i++)
      await ds.undoLastMigration({ transaction: "each" });
    const tables = await ds.query("SHOW TABLES");
    expect(
      tables.map((r: Record<string, string>) => Object.values(r)[0]),
    ).toEqual(["migrations"]);
    await ds.runMigrations({ transaction: "each" });
    const after = await ds.query("SHOW TABLES");
    // Every table comes back (28 with rate_limits; compared, not counted by hand).
    expect(after).toEqual(before);
    expect(after.length).toBeGreaterThanOrEqual(28);
  } finally {
    await ds.destroy();
  }
});
