import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 14: the settings a workshop needs (usual site days for new jobs, the arrival times it
 * offers, how many working days before a visit the reminder goes) and where its set-up stands.
 * Defaults are today's behaviour; workshops that exist already count as set up.
 */
export class WorkshopSettings1765600100000 implements MigrationInterface {
  name = "WorkshopSettings1765600100000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      'ALTER TABLE `workshops` ADD `siteWeekdays` json NOT NULL DEFAULT \'[1,2,3,4,5]\', ADD `arrivalWindows` json NOT NULL DEFAULT \'["morning","afternoon","all-day","range"]\', ADD `reminderDays` int NOT NULL DEFAULT 1, ADD `setupStep` varchar(16) NULL, ADD `setupCompletedAt` datetime(3) NULL',
    );
    await q.query("UPDATE `workshops` SET `setupCompletedAt` = `createdAt`");
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `workshops` DROP COLUMN `setupCompletedAt`, DROP COLUMN `setupStep`, DROP COLUMN `reminderDays`, DROP COLUMN `arrivalWindows`, DROP COLUMN `siteWeekdays`",
    );
  }
}
