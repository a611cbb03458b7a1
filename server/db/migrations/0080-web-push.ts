import type { QueryInterface } from 'sequelize';

// Web push: each browser a person allowed is one subscription; each message to one
// subscription is one outbox row, written in the transaction of the change that caused it and
// sent by a worker (rows claimed with SKIP LOCKED), like mail. The VAPID key pair that signs
// our pushes is generated once and kept in server_keys, so every process signs with the same one.
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE server_keys (
    name VARCHAR(60) NOT NULL PRIMARY KEY,
    value TEXT NOT NULL,
    created_at DATETIME(3) NOT NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await q(`CREATE TABLE push_subscriptions (
    id BIGINT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    endpoint VARCHAR(2000) NOT NULL,
    endpoint_hash CHAR(64) NOT NULL,
    p256dh VARCHAR(200) NOT NULL,
    auth VARCHAR(100) NOT NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY push_subscriptions_endpoint (endpoint_hash),
    KEY push_subscriptions_user (user_id),
    CONSTRAINT push_subscriptions_user_fk FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
  await q(`CREATE TABLE push_outbox (
    id BIGINT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    subscription_id BIGINT UNSIGNED NOT NULL,
    payload TEXT NOT NULL,
    status ENUM('pending','sent','gone') NOT NULL DEFAULT 'pending',
    attempts INT NOT NULL DEFAULT 0,
    next_attempt_at DATETIME(3) NOT NULL,
    last_error VARCHAR(1000) NULL,
    sent_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    KEY push_outbox_due (status, next_attempt_at),
    CONSTRAINT push_outbox_subscription_fk FOREIGN KEY (subscription_id) REFERENCES push_subscriptions (id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('DROP TABLE IF EXISTS push_outbox');
  await qi.sequelize.query('DROP TABLE IF EXISTS push_subscriptions');
  await qi.sequelize.query('DROP TABLE IF EXISTS server_keys');
}
