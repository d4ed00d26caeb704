import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Outbox upkeep: when a failed message was last tried (the attention list's "last tried"), an
 * index for pruning old sent rows, and one for a workshop's failed rows.
 */
export class OutboxFailures1765411200000 implements MigrationInterface {
  name = "OutboxFailures1765411200000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `outbox_messages` ADD `lastAttemptAt` datetime(3) NULL",
    );
    await q.query(
      "CREATE INDEX `ix_outbox_sent` ON `outbox_messages` (`state`, `sentAt`)",
    );
    await q.query(
      "CREATE INDEX `ix_outbox_workshop_state` ON `outbox_messages` (`workshopId`, `state`)",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DROP INDEX `ix_outbox_workshop_state` ON `outbox_messages`");
    await q.query("DROP INDEX `ix_outbox_sent` ON `outbox_messages`");
    await q.query("ALTER TABLE `outbox_messages` DROP COLUMN `lastAttemptAt`");
  }
}
