import type { QueryInterface } from 'sequelize';

const TABLE = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';

// Preventive maintenance: plans, the work orders they (or people) create, booked downtime
// windows, calendar feeds, requalification templates and records, and the spare-parts list.
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);

  // basis_at / basis_counter: where the next interval counts from — the completion when a
  // work order is done, the skipped due point when one is skipped (so a skip moves the plan on).
  await q(`CREATE TABLE maintenance_plans (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    module_id INT UNSIGNED NULL,
    title VARCHAR(160) NOT NULL,
    checklist JSON NOT NULL,
    estimated_minutes INT UNSIGNED NOT NULL,
    every_days INT UNSIGNED NULL,
    every_units INT UNSIGNED NULL,
    counter_name VARCHAR(40) NULL,
    lead_days INT UNSIGNED NOT NULL DEFAULT 0,
    lead_units INT UNSIGNED NOT NULL DEFAULT 0,
    grace_factor DECIMAL(4,2) NOT NULL DEFAULT 1.25,
    basis_at DATETIME(3) NOT NULL,
    basis_counter DOUBLE NULL,
    last_done_at DATETIME(3) NULL,
    active BOOLEAN NOT NULL DEFAULT TRUE,
    version INT UNSIGNED NOT NULL DEFAULT 0,
    created_by_id INT UNSIGNED NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY maintenance_plans_tool (tool_id, active),
    KEY maintenance_plans_active (active, id),
    CONSTRAINT maintenance_plans_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT maintenance_plans_module FOREIGN KEY (module_id) REFERENCES modules(id),
    CONSTRAINT maintenance_plans_creator FOREIGN KEY (created_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${TABLE}`);

  await q(`CREATE TABLE maintenance_plan_changes (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    plan_id INT UNSIGNED NOT NULL,
    actor_id INT UNSIGNED NULL,
    changes JSON NOT NULL,
    created_at DATETIME(3) NOT NULL,
    KEY maintenance_plan_changes_plan (plan_id, created_at),
    CONSTRAINT maintenance_plan_changes_plan FOREIGN KEY (plan_id) REFERENCES maintenance_plans(id) ON DELETE CASCADE,
    CONSTRAINT maintenance_plan_changes_actor FOREIGN KEY (actor_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${TABLE}`);

  // due_key: the due point a scheduled work order was made for; the unique key makes the
  // scheduler idempotent whatever the number of server processes. Hand-made ones have none.
  await q(`CREATE TABLE work_orders (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    module_id INT UNSIGNED NULL,
    plan_id INT UNSIGNED NULL,
    ticket_id INT UNSIGNED NULL,
    kind ENUM('preventive','corrective') NOT NULL,
    title VARCHAR(160) NOT NULL,
    status ENUM('planned','scheduled','in_progress','done','skipped') NOT NULL DEFAULT 'planned',
    due_key VARCHAR(80) NULL,
    due_at DATETIME(3) NULL,
    due_counter DOUBLE NULL,
    grace_until DATETIME(3) NULL,
    grace_until_counter DOUBLE NULL,
    checklist JSON NOT NULL,
    results JSON NOT NULL,
    estimated_minutes INT UNSIGNED NULL,
    hands_on_minutes INT UNSIGNED NULL,
    notes TEXT NULL,
    skip_reason VARCHAR(1000) NULL,
    return_proof JSON NULL,
    started_at DATETIME(3) NULL,
    started_by_id INT UNSIGNED NULL,
    done_at DATETIME(3) NULL,
    done_by_id INT UNSIGNED NULL,
    done_counter DOUBLE NULL,
    within_grace BOOLEAN NULL,
    created_by_id INT UNSIGNED NULL,
    version INT UNSIGNED NOT NULL DEFAULT 0,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY work_orders_plan_due (plan_id, due_key),
    KEY work_orders_tool (tool_id, status, due_at),
    KEY work_orders_status (status, due_at),
    KEY work_orders_done (done_at),
    CONSTRAINT work_orders_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT work_orders_module FOREIGN KEY (module_id) REFERENCES modules(id),
    CONSTRAINT work_orders_plan FOREIGN KEY (plan_id) REFERENCES maintenance_plans(id),
    CONSTRAINT work_orders_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id),
    CONSTRAINT work_orders_started_by FOREIGN KEY (started_by_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT work_orders_done_by FOREIGN KEY (done_by_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT work_orders_created_by FOREIGN KEY (created_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${TABLE}`);

  // One booked downtime window per work order at most; uid is stable for calendar programs,
  // sequence grows on every move (RFC 5545 SEQUENCE).
  await q(`CREATE TABLE maintenance_windows (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    work_order_id INT UNSIGNED NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    uid VARCHAR(80) NOT NULL,
    starts_at DATETIME(3) NOT NULL,
    ends_at DATETIME(3) NOT NULL,
    status ENUM('booked','cancelled') NOT NULL DEFAULT 'booked',
    sequence INT UNSIGNED NOT NULL DEFAULT 0,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY maintenance_windows_work_order (work_order_id),
    UNIQUE KEY maintenance_windows_uid (uid),
    KEY maintenance_windows_tool (tool_id, status, ends_at),
    KEY maintenance_windows_when (status, ends_at),
    CONSTRAINT maintenance_windows_work_order FOREIGN KEY (work_order_id) REFERENCES work_orders(id),
    CONSTRAINT maintenance_windows_tool FOREIGN KEY (tool_id) REFERENCES tools(id)
  ) ${TABLE}`);

  // The secret itself is never stored: only its SHA-256.
  await q(`CREATE TABLE calendar_feeds (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    scope ENUM('facility','area','tool') NOT NULL,
    scope_id INT UNSIGNED NULL,
    label VARCHAR(120) NOT NULL,
    token_hash CHAR(64) NOT NULL,
    revoked_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY calendar_feeds_token (token_hash),
    KEY calendar_feeds_user (user_id),
    CONSTRAINT calendar_feeds_user FOREIGN KEY (user_id) REFERENCES users(id) ON DELETE CASCADE
  ) ${TABLE}`);

  await q(`CREATE TABLE requal_templates (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    name VARCHAR(160) NOT NULL,
    quantity VARCHAR(120) NOT NULL,
    unit VARCHAR(20) NOT NULL,
    points INT UNSIGNED NOT NULL,
    target DOUBLE NULL,
    lsl DOUBLE NULL,
    usl DOUBLE NULL,
    limits JSON NOT NULL,
    active BOOLEAN NOT NULL DEFAULT TRUE,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY requal_templates_tool (tool_id, active),
    CONSTRAINT requal_templates_tool FOREIGN KEY (tool_id) REFERENCES tools(id)
  ) ${TABLE}`);

  await q(`CREATE TABLE requal_records (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    template_id INT UNSIGNED NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    work_order_id INT UNSIGNED NULL,
    ticket_id INT UNSIGNED NULL,
    measurements JSON NOT NULL,
    summary JSON NOT NULL,
    verdicts JSON NOT NULL,
    passed BOOLEAN NOT NULL,
    note VARCHAR(1000) NULL,
    recorded_by_id INT UNSIGNED NULL,
    recorded_at DATETIME(3) NOT NULL,
    KEY requal_records_template (template_id, recorded_at),
    KEY requal_records_tool (tool_id, recorded_at),
    CONSTRAINT requal_records_template FOREIGN KEY (template_id) REFERENCES requal_templates(id),
    CONSTRAINT requal_records_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT requal_records_work_order FOREIGN KEY (work_order_id) REFERENCES work_orders(id),
    CONSTRAINT requal_records_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id),
    CONSTRAINT requal_records_user FOREIGN KEY (recorded_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${TABLE}`);

  // low_notice_at: set when the count fell below the reorder level and the engineers were
  // told; cleared by a restock, so each shortage is announced once.
  await q(`CREATE TABLE parts (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(160) NOT NULL,
    part_number VARCHAR(80) NOT NULL,
    stock INT NOT NULL DEFAULT 0,
    reorder_level INT UNSIGNED NOT NULL DEFAULT 0,
    low_notice_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY parts_number (part_number)
  ) ${TABLE}`);

  await q(`CREATE TABLE part_tools (
    part_id INT UNSIGNED NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    PRIMARY KEY (part_id, tool_id),
    KEY part_tools_tool (tool_id),
    CONSTRAINT part_tools_part FOREIGN KEY (part_id) REFERENCES parts(id) ON DELETE CASCADE,
    CONSTRAINT part_tools_tool FOREIGN KEY (tool_id) REFERENCES tools(id) ON DELETE CASCADE
  ) ${TABLE}`);

  // part_id null: a part not in the list, named in free text.
  await q(`CREATE TABLE part_uses (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    part_id INT UNSIGNED NULL,
    free_text VARCHAR(200) NULL,
    quantity INT UNSIGNED NOT NULL,
    work_order_id INT UNSIGNED NULL,
    ticket_id INT UNSIGNED NULL,
    used_by_id INT UNSIGNED NULL,
    used_at DATETIME(3) NOT NULL,
    KEY part_uses_part (part_id, used_at),
    KEY part_uses_work_order (work_order_id),
    KEY part_uses_ticket (ticket_id),
    CONSTRAINT part_uses_part FOREIGN KEY (part_id) REFERENCES parts(id),
    CONSTRAINT part_uses_work_order FOREIGN KEY (work_order_id) REFERENCES work_orders(id),
    CONSTRAINT part_uses_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id),
    CONSTRAINT part_uses_user FOREIGN KEY (used_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${TABLE}`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of [
    'part_uses',
    'part_tools',
    'parts',
    'requal_records',
    'requal_templates',
    'calendar_feeds',
    'maintenance_windows',
    'work_orders',
    'maintenance_plan_changes',
    'maintenance_plans',
  ]) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
