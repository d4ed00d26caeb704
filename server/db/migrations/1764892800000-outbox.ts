import type { MigrationInterface, QueryRunner } from "typeorm";

/** The e-mail outbox (issue 5, "E-mail reliability"): one row per message, sent by OutboxWorker. */
export class Outbox1764892800000 implements MigrationInterface {
  name = "Outbox1764892800000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `outbox_messages` (`id` char(36) NOT NULL, `workshopId` char(36) NULL, `messageId` varchar(255) NOT NULL, `to` varchar(320) NOT NULL, `subject` varchar(998) NOT NULL, `text` mediumtext NOT NULL, `html` mediumtext NULL, `calendar` json NULL, `state` enum ('pending', 'sending', 'sent', 'failed') NOT NULL DEFAULT 'pending', `attempts` int NOT NULL DEFAULT '0', `nextAttemptAt` datetime(3) NOT NULL, `lastError` text NULL, `claimedBy` varchar(100) NULL, `claimedAt` datetime(3) NULL, `sentAt` datetime(3) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX `uq_outbox_message_id` (`messageId`), INDEX `ix_outbox_due` (`state`, `nextAttemptAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DROP TABLE `outbox_messages`");
  }
}
