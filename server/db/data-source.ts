import "reflect-metadata";
import { DataSource } from "typeorm";
import { entities } from "./entities";
import { migrations } from "./migrations";

export interface DbSettings {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
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
  });
}
