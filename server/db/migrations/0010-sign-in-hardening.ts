import type { QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  // Sign-in attempts per account and address, per account, and per address. An attempt is
  // counted by one conditional UPDATE before the password is checked; after the free
  // attempts each further one must wait a growing delay (next_allowed_at). The count starts
  // over one window after its first attempt (window_started_at).
  await q(`CREATE TABLE sign_in_throttles (
    \`key\` VARCHAR(191) NOT NULL PRIMARY KEY,
    attempts INT UNSIGNED NOT NULL DEFAULT 0,
    window_started_at DATETIME(3) NULL,
    next_allowed_at DATETIME(3) NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // One table of single-use account links: password resets, invitations and mailed sign-in
  // links. Using one voids every other open link of the account (found by the user_id index).
  await q(`ALTER TABLE password_resets ADD COLUMN purpose ENUM('reset','invite','sign_in') NOT NULL DEFAULT 'reset' AFTER user_id`);
  await q(`UPDATE password_resets r JOIN users u ON u.id = r.user_id SET r.purpose = 'invite' WHERE u.password_hash IS NULL`);

  // "Mail me a reset / sign-in link" requests. The request only writes a row here, so a known
  // and an unknown address cost the same; the lookup and the mail happen afterwards.
  await q(`CREATE TABLE account_mail_requests (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    kind ENUM('password_reset','sign_in_link') NOT NULL,
    email VARCHAR(254) NOT NULL,
    created_at DATETIME(3) NOT NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`DROP TABLE IF EXISTS account_mail_requests`);
  await q(`ALTER TABLE password_resets DROP COLUMN purpose`);
  await q(`DROP TABLE IF EXISTS sign_in_throttles`);
}
