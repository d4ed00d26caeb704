import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 13: a per-person session generation (a new password ends the other sessions), when a
 * reset link was voided by another one being used, and the shared rate-limit counters
 * (rate-limiter-flexible's RateLimiterMySQL table, written by every app process).
 */
export class AuthHardening1765513200000 implements MigrationInterface {
  name = "AuthHardening1765513200000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `users` ADD `sessionGeneration` int NOT NULL DEFAULT 0",
    );
    await q.query("ALTER TABLE `auth_tokens` ADD `voidedAt` datetime(3) NULL");
    // The library's own layout (key, points, expire in epoch ms); keys are ASCII (a limit's name
    // and an address or a SHA-256), so no e-mail address is stored.
    await q.query(
      "CREATE TABLE `rate_limits` (`key` varchar(255) CHARACTER SET ascii COLLATE ascii_bin NOT NULL, `points` int NOT NULL DEFAULT 0, `expire` bigint unsigned NULL, PRIMARY KEY (`key`), INDEX `ix_rate_limits_expire` (`expire`)) ENGINE=InnoDB",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DROP TABLE `rate_limits`");
    await q.query("ALTER TABLE `auth_tokens` DROP COLUMN `voidedAt`");
    await q.query("ALTER TABLE `users` DROP COLUMN `sessionGeneration`");
  }
}
