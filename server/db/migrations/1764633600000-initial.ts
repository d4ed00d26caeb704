import type { MigrationInterface, QueryRunner } from "typeorm";

/** The first schema: workshops, people, trades, customers, jobs, programme, bookings, audit, sessions. */
export class Initial1764633600000 implements MigrationInterface {
  name = "Initial1764633600000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `users` (`id` char(36) NOT NULL, `email` varchar(254) NOT NULL, `name` varchar(120) NOT NULL, `passwordHash` varchar(255) NULL, `lastSignInAt` datetime(3) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX `uq_users_email` (`email`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `workshops` (`id` char(36) NOT NULL, `name` varchar(120) NOT NULL, `town` varchar(120) NOT NULL, `timeZone` varchar(64) NOT NULL, `holidayRegion` varchar(8) NULL, `workingWeekdays` json NOT NULL, `dayStart` varchar(5) NOT NULL, `dayEnd` varchar(5) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `workshop_members` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `userId` char(36) NOT NULL, `role` enum ('owner', 'fitter') NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_workshop_members_user` (`userId`), UNIQUE INDEX `uq_workshop_members` (`workshopId`, `userId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `trades` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `businessName` varchar(120) NOT NULL, `kind` enum ('plasterer', 'decorator', 'electrician', 'flooring', 'plumber', 'other') NOT NULL, `contactName` varchar(120) NOT NULL, `email` varchar(254) NOT NULL, `phone` varchar(24) NOT NULL, `workingWeekdays` json NOT NULL, `dayStart` varchar(5) NOT NULL, `dayEnd` varchar(5) NOT NULL, `daysOff` json NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_trades_workshop_kind` (`workshopId`, `kind`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `trade_members` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `tradeId` char(36) NOT NULL, `userId` char(36) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_trade_members_user` (`userId`), UNIQUE INDEX `uq_trade_members` (`tradeId`, `userId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `customers` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `name` varchar(120) NOT NULL, `email` varchar(254) NOT NULL, `phone` varchar(24) NULL, `userId` char(36) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_customers_workshop` (`workshopId`), INDEX `ix_customers_user` (`userId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `jobs` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `customerId` char(36) NOT NULL, `title` varchar(160) NOT NULL, `siteAddress` varchar(300) NOT NULL, `postcode` varchar(10) NOT NULL, `area` varchar(120) NOT NULL, `holidayRegion` varchar(8) NOT NULL, `timeZone` varchar(64) NOT NULL, `status` enum ('survey', 'planned', 'on-site', 'handed-over', 'cancelled') NOT NULL, `handoverDate` varchar(10) NULL, `siteWeekdays` json NOT NULL, `siteClosedDates` json NOT NULL, `accessNotes` text NOT NULL, `version` int NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_jobs_customer` (`customerId`), INDEX `ix_jobs_workshop_status` (`workshopId`, `status`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `tasks` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `name` varchar(160) NOT NULL, `party` enum ('workshop', 'plasterer', 'decorator', 'electrician', 'flooring', 'plumber', 'other') NOT NULL, `durationDays` decimal(5,1) NOT NULL, `notEarlierThan` varchar(10) NULL, `actualStart` varchar(16) NULL, `actualFinish` varchar(16) NULL, `customerNote` text NOT NULL, `internalNote` text NOT NULL, `hazards` json NOT NULL, `sortOrder` int NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_tasks_workshop` (`workshopId`), INDEX `ix_tasks_job_order` (`jobId`, `sortOrder`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `task_links` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `fromTaskId` char(36) NOT NULL, `toTaskId` char(36) NOT NULL, `kind` enum ('FS', 'SS', 'FF') NOT NULL, `lag` decimal(6,1) NOT NULL, `lagUnit` enum ('workingDays', 'elapsedHours') NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_task_links_job` (`jobId`), INDEX `ix_task_links_to` (`toTaskId`), UNIQUE INDEX `uq_task_links` (`fromTaskId`, `toTaskId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `bookings` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `taskId` char(36) NOT NULL, `tradeId` char(36) NOT NULL, `state` enum ('draft', 'sent', 'confirmed', 'declined', 'date-proposed', 'needs-reconfirming', 'cancelled') NOT NULL, `start` varchar(16) NOT NULL, `finish` varchar(16) NOT NULL, `arrivalWindow` enum ('morning', 'afternoon', 'all-day', 'range') NOT NULL, `arrivalFrom` varchar(5) NULL, `arrivalTo` varchar(5) NULL, `icalUid` varchar(64) NOT NULL, `sequence` int NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_bookings_workshop` (`workshopId`), INDEX `ix_bookings_job` (`jobId`), INDEX `ix_bookings_task` (`taskId`), INDEX `ix_bookings_trade_start` (`tradeId`, `start`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `audit_entries` (`id` char(36) NOT NULL, `workshopId` char(36) NULL, `actorUserId` char(36) NULL, `action` varchar(64) NOT NULL, `entityType` varchar(32) NOT NULL, `entityId` char(36) NULL, `detail` json NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_audit_entity` (`entityId`), INDEX `ix_audit_workshop_time` (`workshopId`, `createdAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `auth_tokens` (`id` char(36) NOT NULL, `tokenHash` varchar(64) NOT NULL, `kind` enum ('invitation', 'password-reset') NOT NULL, `userId` char(36) NOT NULL, `workshopId` char(36) NULL, `invitedByUserId` char(36) NULL, `grant` json NOT NULL, `expiresAt` datetime(3) NOT NULL, `usedAt` datetime(3) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), UNIQUE INDEX `uq_auth_tokens_hash` (`tokenHash`), INDEX `ix_auth_tokens_user` (`userId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `workshop_members` ADD CONSTRAINT `FK_1d57c0930ff5e015b52fa0d5780` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `workshop_members` ADD CONSTRAINT `FK_3aa5eb2f862d0ed0241cc948551` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `trades` ADD CONSTRAINT `FK_20ee6eb559336162e3545afa05c` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `trade_members` ADD CONSTRAINT `FK_056fee0c9c8dc135ff1b4a75a0d` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `trade_members` ADD CONSTRAINT `FK_8574470936ff32cf4afdc290ad8` FOREIGN KEY (`tradeId`) REFERENCES `trades`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `trade_members` ADD CONSTRAINT `FK_95a102dd960019ce5b88bd1c63c` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `customers` ADD CONSTRAINT `FK_6e329b80a9f9652903b3bb1933b` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `customers` ADD CONSTRAINT `FK_b8512aa9cef03d90ed5744c94d7` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE SET NULL ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `jobs` ADD CONSTRAINT `FK_1924eb46be9215105999f475f66` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `jobs` ADD CONSTRAINT `FK_15be39eec1b46b46690fd5460d0` FOREIGN KEY (`customerId`) REFERENCES `customers`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `tasks` ADD CONSTRAINT `FK_f215ca000db56953a67baa23034` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `task_links` ADD CONSTRAINT `FK_84b1ae7ab4ce0fecb382f318081` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `task_links` ADD CONSTRAINT `FK_98465201e2fa2bc3806b87b4085` FOREIGN KEY (`fromTaskId`) REFERENCES `tasks`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `task_links` ADD CONSTRAINT `FK_4415cb8e8312cb3121f28273974` FOREIGN KEY (`toTaskId`) REFERENCES `tasks`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `bookings` ADD CONSTRAINT `FK_026680bde91aa2f6e19b95e0e77` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `bookings` ADD CONSTRAINT `FK_db881f82b8d62f0e7f8674d0bd4` FOREIGN KEY (`taskId`) REFERENCES `tasks`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `bookings` ADD CONSTRAINT `FK_77603cdd0b7647456758f4db0e8` FOREIGN KEY (`tradeId`) REFERENCES `trades`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `auth_tokens` ADD CONSTRAINT `FK_c25fb956ebada4b256501585cca` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    // express-mysql-session's table, created here because the store is told not to create it.
    await q.query(
      "CREATE TABLE `sessions` (`session_id` varchar(128) COLLATE utf8mb4_bin NOT NULL, `expires` int(11) unsigned NOT NULL, `data` mediumtext COLLATE utf8mb4_bin, PRIMARY KEY (`session_id`)) ENGINE=InnoDB",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("SET FOREIGN_KEY_CHECKS = 0");
    for (const t of [
      "sessions",
      "auth_tokens",
      "audit_entries",
      "bookings",
      "task_links",
      "tasks",
      "jobs",
      "customers",
      "trade_members",
      "trades",
      "workshop_members",
      "workshops",
      "users",
    ])
      await q.query(`DROP TABLE IF EXISTS \`${t}\``);
    await q.query("SET FOREIGN_KEY_CHECKS = 1");
  }
}
