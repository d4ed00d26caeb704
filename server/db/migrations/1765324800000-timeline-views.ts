import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The customer's timeline (issue 8): when each person last looked at a job's visits and what
 * they showed then, so later changes are highlighted. After the thread's migration.
 */
export class TimelineViews1765324800000 implements MigrationInterface {
  name = "TimelineViews1765324800000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `timeline_views` (`id` char(36) NOT NULL, `userId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `seenAt` datetime(3) NOT NULL, `seen` json NOT NULL, INDEX `ix_timeline_views_job` (`jobId`), UNIQUE INDEX `uq_timeline_views_user_job` (`userId`, `jobId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `timeline_views` ADD CONSTRAINT `FK_0f576da76f4f122eb27c9269e19` FOREIGN KEY (`userId`) REFERENCES `users`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `timeline_views` ADD CONSTRAINT `FK_9c0f81b6e446938295a2159ece6` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `timeline_views` DROP FOREIGN KEY `FK_9c0f81b6e446938295a2159ece6`",
    );
    await q.query(
      "ALTER TABLE `timeline_views` DROP FOREIGN KEY `FK_0f576da76f4f122eb27c9269e19`",
    );
    await q.query("DROP TABLE `timeline_views`");
  }
}
