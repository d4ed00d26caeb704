import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The job thread (issue 7): messages with an AUTO_INCREMENT `seq` (the exact poll cursor),
 * attachments (stored files, one message each), per-person read positions and the batched
 * e-mail notices owed. After the stored files and drawings migrations, as attachments refer to
 * `stored_files`.
 */
export class Thread1765238400000 implements MigrationInterface {
  name = "Thread1765238400000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `thread_messages` (`seq` bigint NOT NULL AUTO_INCREMENT, `id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `audience` enum ('job', 'trades', 'workshop') NOT NULL, `kind` enum ('message', 'system') NOT NULL, `text` text NOT NULL, `authorUserId` char(36) NULL, `authorName` varchar(120) NULL, `authorLabel` varchar(120) NULL, `authorRole` enum ('workshop', 'trade', 'customer') NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX `uq_thread_messages_id` (`id`), INDEX `ix_thread_messages_author` (`authorUserId`), INDEX `ix_thread_messages_job_seq` (`jobId`, `seq`), PRIMARY KEY (`seq`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `thread_attachments` (`id` char(36) NOT NULL, `messageSeq` bigint NOT NULL, `fileId` char(36) NOT NULL, `position` int NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX `uq_thread_attachments_file` (`fileId`), INDEX `ix_thread_attachments_message` (`messageSeq`, `position`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `thread_reads` (`id` char(36) NOT NULL, `userId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `lastReadSeq` bigint NOT NULL DEFAULT '0', `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_thread_reads_job` (`jobId`), UNIQUE INDEX `uq_thread_reads_user_job` (`userId`, `jobId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `thread_notices` (`id` char(36) NOT NULL, `userId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `dueAt` datetime(3) NULL, `lastNoticedSeq` bigint NOT NULL DEFAULT '0', `lastSentAt` datetime(3) NULL, INDEX `ix_thread_notices_job` (`jobId`), INDEX `ix_thread_notices_due` (`dueAt`), UNIQUE INDEX `uq_thread_notices_user_job` (`userId`, `jobId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `thread_messages` ADD CONSTRAINT `FK_ab44cbbe986a30fccb886aae295` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_messages` ADD CONSTRAINT `FK_8a689c90274351eb1aa8d27e0da` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_messages` ADD CONSTRAINT `FK_0cccd3d99707cb7b0f512eaf5d2` FOREIGN KEY (`authorUserId`) REFERENCES `users`(`id`) ON DELETE SET NULL ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_attachments` ADD CONSTRAINT `FK_0482bdfe89384da3439ff93959f` FOREIGN KEY (`messageSeq`) REFERENCES `thread_messages`(`seq`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_attachments` ADD CONSTRAINT `FK_c3a4d852cd9c84c7ed5a641fa46` FOREIGN KEY (`fileId`) REFERENCES `stored_files`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_reads` ADD CONSTRAINT `FK_8eddd9dd38db27fc9abdb05da56` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_reads` ADD CONSTRAINT `FK_1cd8bb58b7e2245c788280a8382` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_notices` ADD CONSTRAINT `FK_e59479ec2c02d1185d6f18d5462` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `thread_notices` ADD CONSTRAINT `FK_7108591bf3576eadb1c90a4b7b6` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `thread_notices` DROP FOREIGN KEY `FK_7108591bf3576eadb1c90a4b7b6`",
    );
    await q.query(
      "ALTER TABLE `thread_notices` DROP FOREIGN KEY `FK_e59479ec2c02d1185d6f18d5462`",
    );
    await q.query(
      "ALTER TABLE `thread_reads` DROP FOREIGN KEY `FK_1cd8bb58b7e2245c788280a8382`",
    );
    await q.query(
      "ALTER TABLE `thread_reads` DROP FOREIGN KEY `FK_8eddd9dd38db27fc9abdb05da56`",
    );
    await q.query(
      "ALTER TABLE `thread_attachments` DROP FOREIGN KEY `FK_c3a4d852cd9c84c7ed5a641fa46`",
    );
    await q.query(
      "ALTER TABLE `thread_attachments` DROP FOREIGN KEY `FK_0482bdfe89384da3439ff93959f`",
    );
    await q.query(
      "ALTER TABLE `thread_messages` DROP FOREIGN KEY `FK_0cccd3d99707cb7b0f512eaf5d2`",
    );
    await q.query(
      "ALTER TABLE `thread_messages` DROP FOREIGN KEY `FK_8a689c90274351eb1aa8d27e0da`",
    );
    await q.query(
      "ALTER TABLE `thread_messages` DROP FOREIGN KEY `FK_ab44cbbe986a30fccb886aae295`",
    );
    await q.query("DROP TABLE `thread_notices`");
    await q.query("DROP TABLE `thread_reads`");
    await q.query("DROP TABLE `thread_attachments`");
    await q.query("DROP TABLE `thread_messages`");
  }
}
