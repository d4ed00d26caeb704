import type { MigrationInterface, QueryRunner } from "typeorm";

/** Booking answers (issue 5): confirmation links, proposals, reminders, and every state change. */
export class BookingAnswers1764806400000 implements MigrationInterface {
  name = "BookingAnswers1764806400000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `booking_events` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `bookingId` char(36) NOT NULL, `fromState` enum ('draft', 'sent', 'confirmed', 'declined', 'date-proposed', 'needs-reconfirming', 'cancelled') NULL, `toState` enum ('draft', 'sent', 'confirmed', 'declined', 'date-proposed', 'needs-reconfirming', 'cancelled') NOT NULL, `actorUserId` char(36) NULL, `channel` enum ('app', 'link', 'phone', 'text', 'calendar-reply', 'system') NOT NULL, `note` text NOT NULL, `detail` json NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_booking_events_booking` (`bookingId`, `createdAt`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    for (const col of [
      "`proposedStart` varchar(16) NULL",
      "`shareAddress` tinyint NOT NULL DEFAULT 0",
      "`overrideReason` text NULL",
      "`linkTokenHash` varchar(64) NULL",
      "`linkExpiresAt` datetime(3) NULL",
      "`linkForStart` varchar(16) NULL",
      "`sentAt` datetime(3) NULL",
      "`answeredAt` datetime(3) NULL",
      "`reminderSentAt` datetime(3) NULL",
      "`chasedAt` datetime(3) NULL",
    ]) {
      await q.query(`ALTER TABLE \`bookings\` ADD ${col}`);
    }
    await q.query(
      "CREATE UNIQUE INDEX `uq_bookings_link_token` ON `bookings` (`linkTokenHash`)",
    );
    await q.query(
      "ALTER TABLE `booking_events` ADD CONSTRAINT `FK_d49ecfcfd991d884a03e8488e32` FOREIGN KEY (`bookingId`) REFERENCES `bookings`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DROP TABLE `booking_events`");
    await q.query("DROP INDEX `uq_bookings_link_token` ON `bookings`");
    for (const col of [
      "proposedStart",
      "shareAddress",
      "overrideReason",
      "linkTokenHash",
      "linkExpiresAt",
      "linkForStart",
      "sentAt",
      "answeredAt",
      "reminderSentAt",
      "chasedAt",
    ]) {
      await q.query(`ALTER TABLE \`bookings\` DROP COLUMN \`${col}\``);
    }
  }
}
