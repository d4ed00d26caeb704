import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 14: sign-up. When a person's e-mail address was proved (`users.emailVerifiedAt`), and
 * the address-check link kind. Everyone already here counts as verified: they came by an
 * invitation or were seeded, and an invitation link proves the address.
 */
export class SignUp1765600000000 implements MigrationInterface {
  name = "SignUp1765600000000";

  public async up(q: QueryRunner): Promise<void> {
    await q.query("ALTER TABLE `users` ADD `emailVerifiedAt` datetime(3) NULL");
    await q.query("UPDATE `users` SET `emailVerifiedAt` = `createdAt`");
    await q.query(
      "ALTER TABLE `auth_tokens` MODIFY `kind` enum ('invitation', 'password-reset', 'verify-email') NOT NULL",
    );
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query("DELETE FROM `auth_tokens` WHERE `kind` = 'verify-email'");
    await q.query(
      "ALTER TABLE `auth_tokens` MODIFY `kind` enum ('invitation', 'password-reset') NOT NULL",
    );
    await q.query("ALTER TABLE `users` DROP COLUMN `emailVerifiedAt`");
  }
}
