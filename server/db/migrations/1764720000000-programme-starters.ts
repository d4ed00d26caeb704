import type { MigrationInterface, QueryRunner } from "typeorm";

/** Starting programmes per workshop (issue 4). */
export class ProgrammeStarters1764720000000 implements MigrationInterface {
  name = "ProgrammeStarters1764720000000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `programme_starters` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `name` varchar(120) NOT NULL, `description` varchar(300) NOT NULL, `tasks` json NOT NULL, `links` json NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_programme_starters_workshop` (`workshopId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DROP TABLE `programme_starters`");
  }
}
