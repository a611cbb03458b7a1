import type { QueryInterface } from 'sequelize';

// On-call rota, escalation and pages by SMS (issue 14).
// - oncall_contacts: the number a person is paged on (kept apart from the account).
// - oncall_shifts: who is on call or backup from when to when, optionally repeating weekly.
// - oncall_covers: someone else takes a role for a while (a swap is two covers).
// - oncall_policies: per severity, minutes between steps, who the last step is, the night window.
// - oncall_escalations: one per ticket while it runs (open_ticket_id is unique while open, so
//   two processes cannot start two); oncall_pages: each page sent, with its single-use link.
// - sms_outbox: texts go out like mail, through an outbox (idempotency key per text);
//   sms_inbound: each provider event once (providers resend webhooks).
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  const opts = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
  await q(`CREATE TABLE oncall_contacts (
    user_id INT UNSIGNED NOT NULL PRIMARY KEY,
    phone VARCHAR(20) NOT NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY oncall_contacts_phone (phone),
    CONSTRAINT oncall_contacts_user_fk FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ${opts}`);
  await q(`CREATE TABLE oncall_shifts (
    id INT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    duty ENUM('on_call','backup') NOT NULL,
    starts_at DATETIME(3) NOT NULL,
    ends_at DATETIME(3) NOT NULL,
    weekly BOOLEAN NOT NULL DEFAULT FALSE,
    repeat_until DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY oncall_shifts_starts (starts_at),
    CONSTRAINT oncall_shifts_user_fk FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ${opts}`);
  await q(`CREATE TABLE oncall_covers (
    id INT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    duty ENUM('on_call','backup') NOT NULL,
    starts_at DATETIME(3) NOT NULL,
    ends_at DATETIME(3) NOT NULL,
    note VARCHAR(200) NOT NULL DEFAULT '',
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY oncall_covers_ends (ends_at),
    CONSTRAINT oncall_covers_user_fk FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ${opts}`);
  await q(`CREATE TABLE oncall_policies (
    severity ENUM('hazard','p1') NOT NULL PRIMARY KEY,
    step_minutes INT UNSIGNED NOT NULL,
    manager_id INT UNSIGNED NULL,
    night_starts CHAR(5) NULL,
    night_ends CHAR(5) NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT oncall_policies_manager_fk FOREIGN KEY (manager_id) REFERENCES users (id) ON DELETE SET NULL
  ) ${opts}`);
  await q(`CREATE TABLE oncall_escalations (
    id INT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    ticket_id INT UNSIGNED NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    open_ticket_id INT UNSIGNED NULL,
    severity ENUM('hazard','p1') NOT NULL,
    status ENUM('open','acknowledged','unanswered') NOT NULL DEFAULT 'open',
    step TINYINT UNSIGNED NOT NULL DEFAULT 0,
    step_minutes INT UNSIGNED NOT NULL,
    next_step_at DATETIME(3) NULL,
    headline VARCHAR(300) NOT NULL,
    details TEXT NOT NULL,
    acknowledged_at DATETIME(3) NULL,
    acknowledged_by INT UNSIGNED NULL,
    acknowledged_via ENUM('link','sms','app') NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY oncall_escalations_open (open_ticket_id),
    KEY oncall_escalations_ticket (ticket_id),
    KEY oncall_escalations_due (status, next_step_at),
    CONSTRAINT oncall_escalations_ticket_fk FOREIGN KEY (ticket_id) REFERENCES tickets (id) ON DELETE CASCADE,
    CONSTRAINT oncall_escalations_ack_fk FOREIGN KEY (acknowledged_by) REFERENCES users (id) ON DELETE SET NULL
  ) ${opts}`);
  await q(`CREATE TABLE oncall_pages (
    id INT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    escalation_id INT UNSIGNED NOT NULL,
    step TINYINT UNSIGNED NOT NULL,
    user_id INT UNSIGNED NOT NULL,
    phone VARCHAR(20) NULL,
    reply_code CHAR(4) NOT NULL,
    token_hash CHAR(64) NOT NULL,
    link_used_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY oncall_pages_token (token_hash),
    KEY oncall_pages_escalation (escalation_id),
    KEY oncall_pages_phone (phone, created_at),
    CONSTRAINT oncall_pages_escalation_fk FOREIGN KEY (escalation_id) REFERENCES oncall_escalations (id) ON DELETE CASCADE,
    CONSTRAINT oncall_pages_user_fk FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
  ) ${opts}`);
  await q(`CREATE TABLE sms_outbox (
    id BIGINT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    to_number VARCHAR(20) NOT NULL,
    body VARCHAR(1000) NOT NULL,
    idempotency_key VARCHAR(80) NOT NULL,
    status ENUM('pending','sent') NOT NULL DEFAULT 'pending',
    attempts INT UNSIGNED NOT NULL DEFAULT 0,
    next_attempt_at DATETIME(3) NOT NULL,
    last_error VARCHAR(1000) NULL,
    provider_id VARCHAR(100) NULL,
    sent_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY sms_outbox_key (idempotency_key),
    KEY sms_outbox_due (status, next_attempt_at)
  ) ${opts}`);
  await q(`CREATE TABLE sms_inbound (
    id BIGINT UNSIGNED NOT NULL AUTO_INCREMENT PRIMARY KEY,
    event_id VARCHAR(100) NOT NULL,
    from_number VARCHAR(20) NOT NULL,
    body VARCHAR(1000) NOT NULL,
    page_id INT UNSIGNED NULL,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY sms_inbound_event (event_id)
  ) ${opts}`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of [
    'sms_inbound',
    'sms_outbox',
    'oncall_pages',
    'oncall_escalations',
    'oncall_policies',
    'oncall_covers',
    'oncall_shifts',
    'oncall_contacts',
  ])
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
}
