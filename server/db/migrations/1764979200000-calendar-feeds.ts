import type { MigrationInterface, QueryRunner } from "typeorm";

/** Per-person calendar subscription feeds (issue 6): one row per secret URL, only its hash kept. */
export class CalendarFeeds1764979200000 implements MigrationInterface {
  name = "CalendarFeeds1764979200000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `calendar_feeds` (`id` char(36) NOT NULL, `userId` char(36) NOT NULL, `tokenHash` varchar(64) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `revokedAt` datetime(3) NULL, INDEX `ix_calendar_feeds_user` (`userId`), UNIQUE INDEX `uq_calendar_feeds_token` (`tokenHash`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `calendar_feeds` ADD CONSTRAINT `FK_cf31466b7789c6df501598bed0f` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `calendar_feeds` DROP FOREIGN KEY `FK_cf31466b7789c6df501598bed0f`",
    );
    await q.query("DROP TABLE `calendar_feeds`");
  }
}
