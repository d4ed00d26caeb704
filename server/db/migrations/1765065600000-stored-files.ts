import type { MigrationInterface, QueryRunner } from "typeorm";

/** Uploaded files (issue 7): one row per object in the bucket, with its sniffed type and hash. */
export class StoredFiles1765065600000 implements MigrationInterface {
  name = "StoredFiles1765065600000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query(
      "CREATE TABLE `stored_files` (`id` char(36) NOT NULL, `workshopId` char(36) NOT NULL, `storageKey` varchar(200) NOT NULL, `originalName` varchar(255) NOT NULL, `mimeType` varchar(100) NOT NULL, `extension` varchar(10) NOT NULL, `sizeBytes` int NOT NULL, `sha256` char(64) NOT NULL, `width` int NULL, `height` int NULL, `thumbnailKey` varchar(200) NULL, `uploadedByUserId` char(36) NOT NULL, `createdAt` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(6), INDEX `ix_stored_files_workshop` (`workshopId`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await q.query(
      "ALTER TABLE `stored_files` ADD CONSTRAINT `FK_647037ad645208b079b78a0366c` FOREIGN KEY (`workshopId`) REFERENCES `workshops`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query(
      "ALTER TABLE `stored_files` DROP FOREIGN KEY `FK_647037ad645208b079b78a0366c`",
    );
    await q.query("DROP TABLE `stored_files`");
  }
}
