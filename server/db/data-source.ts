import "reflect-metadata";
import { AdvancedConsoleLogger, DataSource, type QueryRunner } from "typeorm";
import { isDatabaseUnreachable } from "./database-watch";
import { countStatement } from "./query-tally";
import { entities } from "./entities";
import { migrations } from "./migrations";

export interface DbSettings {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

/**
 * TypeORM's console logger, except for queries that failed because the database is unreachable:
 * those reach the caller, which hands them to the DatabaseWatch (one line per outage). Every
 * statement is counted for the request that sent it (server/db/query-tally.ts).
 */
class OutageQuietLogger extends AdvancedConsoleLogger {
  override logQuery(
    query: string,
    parameters?: unknown[],
    queryRunner?: QueryRunner,
  ): void {
    countStatement();
    super.logQuery(query, parameters, queryRunner);
  }

  override logQueryError(
    error: string,
    query: string,
    parameters?: unknown[],
    queryRunner?: QueryRunner,
  ): void {
    if (isDatabaseUnreachable(error)) return;
    super.logQueryError(error, query, parameters, queryRunner);
  }
}

/** A TypeORM data source for MariaDB; schema changes only through migrations. */
export function createDataSource(db: DbSettings): DataSource {
  return new DataSource({
    type: "mysql",
    host: db.host,
    port: db.port,
    username: db.user,
    password: db.password,
    database: db.database,
    entities,
    migrations,
    migrationsRun: false,
    synchronize: false,
    timezone: "Z",
    charset: "utf8mb4_unicode_ci",
    poolSize: 10,
    logging: ["error"],
    logger: new OutageQuietLogger(["error"]),
  });
}
