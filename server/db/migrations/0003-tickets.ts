import type { QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  // Enumerations whose members the app may grow (categories, hazards) are VARCHAR/JSON checked
  // by the shared zod schemas; the workflow's statuses are fixed by the shared state machine.
  await q(`CREATE TABLE tickets (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    module_id INT UNSIGNED NULL,
    category VARCHAR(40) NOT NULL,
    title VARCHAR(160) NOT NULL,
    description TEXT NULL,
    alarm_text VARCHAR(1000) NULL,
    impact ENUM('tool_stopped','tool_limited','still_usable') NOT NULL,
    hazards JSON NOT NULL,
    wafers_count INT UNSIGNED NOT NULL DEFAULT 0,
    wafers_owner VARCHAR(120) NULL,
    wafers_recoverable ENUM('yes','no','unknown') NULL,
    status ENUM('reported','acknowledged','in_repair','waiting','fixed','closed','merged','no_fault_found') NOT NULL DEFAULT 'reported',
    wait_reason ENUM('parts','vendor','facilities','user') NULL,
    priority ENUM('P1','P2','P3','P4') NOT NULL,
    priority_overridden BOOLEAN NOT NULL DEFAULT FALSE,
    reporter_id INT UNSIGNED NULL,
    assignee_id INT UNSIGNED NULL,
    merged_into_id INT UNSIGNED NULL,
    fix_kind ENUM('failure','assist') NULL,
    failure_mode VARCHAR(120) NULL,
    cause TEXT NULL,
    work_done TEXT NULL,
    parts_used TEXT NULL,
    hands_on_minutes INT UNSIGNED NULL,
    wafers_recovered INT UNSIGNED NULL,
    wafers_returned INT UNSIGNED NULL,
    acknowledged_at DATETIME(3) NULL,
    fixed_at DATETIME(3) NULL,
    closed_at DATETIME(3) NULL,
    resolved_at DATETIME(3) NULL,
    version INT UNSIGNED NOT NULL DEFAULT 0,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY tickets_queue (status, priority, created_at),
    KEY tickets_tool (tool_id, status),
    KEY tickets_assignee (assignee_id, status),
    KEY tickets_reporter (reporter_id, created_at),
    KEY tickets_created (created_at),
    CONSTRAINT tickets_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT tickets_module FOREIGN KEY (module_id) REFERENCES modules(id),
    CONSTRAINT tickets_reporter FOREIGN KEY (reporter_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT tickets_assignee FOREIGN KEY (assignee_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT tickets_merged FOREIGN KEY (merged_into_id) REFERENCES tickets(id)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // The timeline: append-only. Every change records who, what, when and before -> after (data).
  await q(`CREATE TABLE ticket_events (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    ticket_id INT UNSIGNED NOT NULL,
    actor_id INT UNSIGNED NULL,
    kind VARCHAR(40) NOT NULL,
    internal BOOLEAN NOT NULL DEFAULT FALSE,
    body TEXT NULL,
    data JSON NULL,
    created_at DATETIME(3) NOT NULL,
    KEY ticket_events_ticket (ticket_id, id),
    CONSTRAINT ticket_events_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id),
    CONSTRAINT ticket_events_actor FOREIGN KEY (actor_id) REFERENCES users(id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE photos (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    ticket_id INT UNSIGNED NOT NULL,
    event_id BIGINT UNSIGNED NULL,
    uploader_id INT UNSIGNED NULL,
    stored_name VARCHAR(80) NOT NULL,
    thumb_name VARCHAR(80) NOT NULL,
    mime VARCHAR(40) NOT NULL,
    width INT UNSIGNED NOT NULL,
    height INT UNSIGNED NOT NULL,
    bytes INT UNSIGNED NOT NULL,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY photos_stored (stored_name),
    KEY photos_ticket (ticket_id),
    CONSTRAINT photos_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id),
    CONSTRAINT photos_event FOREIGN KEY (event_id) REFERENCES ticket_events(id),
    CONSTRAINT photos_uploader FOREIGN KEY (uploader_id) REFERENCES users(id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE service_targets (
    priority ENUM('P1','P2','P3','P4') NOT NULL PRIMARY KEY,
    acknowledge_minutes INT UNSIGNED NOT NULL,
    restore_minutes INT UNSIGNED NOT NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`ALTER TABLE state_intervals ADD CONSTRAINT state_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id)`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE state_intervals DROP FOREIGN KEY state_ticket`);
  for (const t of ['service_targets', 'photos', 'ticket_events', 'tickets']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
