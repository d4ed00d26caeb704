import type { MigrationInterface, QueryRunner } from "typeorm";

/** Drawings, templates and site photos on a job (issue 7): revisions A…Z on stored files, and the tasks each is for. */
export class Drawings1765152000000 implements MigrationInterface {
  name = "Drawings1765152000000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `drawings` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `jobId` char(36) NOT NULL, `title` varchar(160) NOT NULL, `kind` enum ('drawing', 'template', 'site_photo') NOT NULL, `currentRevision` varchar(1) NOT NULL, `shareTradeKinds` json NOT NULL, `shareTradeIds` json NOT NULL, `shareWithCustomer` tinyint NOT NULL DEFAULT 0, `createdByUserId` char(36) NOT NULL, `createdByTradeId` char(36) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), `updatedAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6) ON UPDATE CURRENT_TIMESTAMP(6), INDEX `ix_drawings_workshop` (`workshopId`), INDEX `ix_drawings_job` (`jobId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `drawing_revisions` (`id` char(36) NOT NULL, `drawingId` char(36) NOT NULL, `letter` varchar(1) NOT NULL, `note` varchar(1000) NOT NULL, `fileId` char(36) NOT NULL, `uploadedByUserId` char(36) NOT NULL, `uploadedByTradeId` char(36) NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_drawing_revisions_file` (`fileId`), UNIQUE INDEX `uq_drawing_revisions_letter` (`drawingId`, `letter`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "CREATE TABLE `drawing_tasks` (`drawingId` char(36) NOT NULL, `taskId` char(36) NOT NULL, INDEX `ix_drawing_tasks_task` (`taskId`), PRIMARY KEY (`drawingId`, `taskId`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `drawings` ADD CONSTRAINT `FK_6b3edea0f27412f8ece5d2f8820` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `drawings` ADD CONSTRAINT `FK_226c21a730a204c622c46030ce0` FOREIGN KEY (`jobId`) REFERENCES `jobs`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `drawing_revisions` ADD CONSTRAINT `FK_a363bcd43c930bbebe64f3dd923` FOREIGN KEY (`drawingId`) REFERENCES `drawings`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `drawing_revisions` ADD CONSTRAINT `FK_ca13f3cb7276da59dd6f1ea16ce` FOREIGN KEY (`fileId`) REFERENCES `stored_files`(`id`) ON DELETE RESTRICT ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `drawing_tasks` ADD CONSTRAINT `FK_c21afc7d23b613ba7e144de8ff4` FOREIGN KEY (`drawingId`) REFERENCES `drawings`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await q.query(
      "ALTER TABLE `drawing_tasks` ADD CONSTRAINT `FK_8a34e92fb87df453d01c9a14936` FOREIGN KEY (`taskId`) REFERENCES `tasks`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    for (const [table, fk] of [
      ["drawing_tasks", "FK_8a34e92fb87df453d01c9a14936"],
      ["drawing_tasks", "FK_c21afc7d23b613ba7e144de8ff4"],
      ["drawing_revisions", "FK_ca13f3cb7276da59dd6f1ea16ce"],
      ["drawing_revisions", "FK_a363bcd43c930bbebe64f3dd923"],
      ["drawings", "FK_226c21a730a204c622c46030ce0"],
      ["drawings", "FK_6b3edea0f27412f8ece5d2f8820"],
    ])
      await q.query(`ALTER TABLE \`${table}\` DROP FOREIGN KEY \`${fk}\``);
    await q.query("DROP TABLE `drawing_tasks`");
    await q.query("DROP TABLE `drawing_revisions`");
    await q.query("DROP TABLE `drawings`");
  }
}
