import type { QueryInterface } from 'sequelize';

// Raw DDL: generated columns, CHECKs and exact types read more plainly in SQL.
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE users (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    email VARCHAR(254) NOT NULL,
    name VARCHAR(120) NOT NULL,
    role ENUM('member','technician','manager','admin') NOT NULL DEFAULT 'member',
    password_hash VARCHAR(255) NULL,
    active BOOLEAN NOT NULL DEFAULT TRUE,
    on_call BOOLEAN NOT NULL DEFAULT FALSE,
    last_sign_in_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY users_email (email)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // express-session rows (connect-session-sequelize); user_id lets us end every session of a user.
  await q(`CREATE TABLE sessions (
    sid VARCHAR(64) NOT NULL PRIMARY KEY,
    expires DATETIME(3) NULL,
    data MEDIUMTEXT NULL,
    user_id INT UNSIGNED NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY sessions_user (user_id),
    KEY sessions_expires (expires)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // Fixed-window counters for sign-in throttling and rate limits, shared by every server process.
  await q(`CREATE TABLE throttles (
    \`key\` VARCHAR(191) NOT NULL PRIMARY KEY,
    hits INT UNSIGNED NOT NULL,
    window_started_at DATETIME(3) NOT NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE password_resets (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    token_hash CHAR(64) NOT NULL,
    expires_at DATETIME(3) NOT NULL,
    used_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY password_resets_token (token_hash),
    CONSTRAINT password_resets_user FOREIGN KEY (user_id) REFERENCES users(id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // Every e-mail is written here in the same transaction as the change that causes it; the
  // outbox worker sends it and retries with back-off while SMTP is unreachable.
  await q(`CREATE TABLE outbox_mails (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    to_address VARCHAR(320) NOT NULL,
    subject VARCHAR(255) NOT NULL,
    text_body MEDIUMTEXT NOT NULL,
    html_body MEDIUMTEXT NULL,
    status ENUM('pending','sent','dead') NOT NULL DEFAULT 'pending',
    attempts INT UNSIGNED NOT NULL DEFAULT 0,
    next_attempt_at DATETIME(3) NOT NULL,
    last_error VARCHAR(1000) NULL,
    sent_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY outbox_due (status, next_attempt_at)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['outbox_mails', 'password_resets', 'throttles', 'sessions', 'users']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
