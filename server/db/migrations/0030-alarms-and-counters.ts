import type { QueryInterface } from 'sequelize';
import { DEFAULT_CATEGORY_RULES } from '../../../shared/schemas/alarms';

// Alarms and usage counters posted by the tools themselves (or by a forwarder reading a tool's
// log). Raw events are kept with the sender's id, unique per tool, so retries count once and
// the set/clear intervals can be rebuilt in time order when events arrive late.
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  const tail = `ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`;
  const rule = `ENUM('record','notify','ticket','ticket_down')`;

  // Only the SHA-256 of a key is stored; the key itself is shown once when it is made.
  await q(`CREATE TABLE tool_keys (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    label VARCHAR(80) NOT NULL,
    key_hash CHAR(64) NOT NULL,
    key_hint VARCHAR(12) NOT NULL,
    created_by_id INT UNSIGNED NULL,
    created_at DATETIME(3) NOT NULL,
    last_used_at DATETIME(3) NULL,
    revoked_at DATETIME(3) NULL,
    UNIQUE KEY tool_keys_hash (key_hash),
    KEY tool_keys_tool (tool_id),
    CONSTRAINT tool_keys_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT tool_keys_creator FOREIGN KEY (created_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${tail}`);

  await q(`CREATE TABLE alarm_definitions (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    alarm_key VARCHAR(64) NOT NULL,
    text VARCHAR(500) NOT NULL,
    category TINYINT UNSIGNED NULL,
    rule ${rule} NULL,
    module_id INT UNSIGNED NULL,
    chattering_since DATETIME(3) NULL,
    held_count INT UNSIGNED NOT NULL DEFAULT 0,
    last_notified_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY alarm_definitions_key (tool_id, alarm_key),
    KEY alarm_definitions_chatter (chattering_since),
    CONSTRAINT alarm_definitions_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT alarm_definitions_module FOREIGN KEY (module_id) REFERENCES modules(id)
  ) ${tail}`);

  await q(`CREATE TABLE alarm_events (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    sender_id VARCHAR(100) NOT NULL,
    definition_id INT UNSIGNED NOT NULL,
    is_set BOOLEAN NOT NULL,
    category TINYINT UNSIGNED NULL,
    text VARCHAR(500) NULL,
    module_id INT UNSIGNED NULL,
    source ENUM('tool','person') NOT NULL DEFAULT 'tool',
    actor_id INT UNSIGNED NULL,
    at DATETIME(3) NOT NULL,
    received_at DATETIME(3) NOT NULL,
    UNIQUE KEY alarm_events_sender (tool_id, sender_id),
    KEY alarm_events_definition (definition_id, at, id),
    CONSTRAINT alarm_events_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT alarm_events_definition FOREIGN KEY (definition_id) REFERENCES alarm_definitions(id),
    CONSTRAINT alarm_events_actor FOREIGN KEY (actor_id) REFERENCES users(id) ON DELETE SET NULL
  ) ${tail}`);

  await q(`CREATE TABLE alarm_occurrences (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    definition_id INT UNSIGNED NOT NULL,
    module_id INT UNSIGNED NULL,
    set_at DATETIME(3) NOT NULL,
    cleared_at DATETIME(3) NULL,
    cleared_by ENUM('tool','person') NULL,
    ticket_id INT UNSIGNED NULL,
    chattering BOOLEAN NOT NULL DEFAULT FALSE,
    created_at DATETIME(3) NOT NULL,
    KEY alarm_occurrences_tool (tool_id, set_at),
    KEY alarm_occurrences_open (cleared_at, tool_id),
    KEY alarm_occurrences_definition (definition_id, set_at),
    KEY alarm_occurrences_ticket (ticket_id),
    KEY alarm_occurrences_set (set_at),
    CONSTRAINT alarm_occurrences_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT alarm_occurrences_definition FOREIGN KEY (definition_id) REFERENCES alarm_definitions(id),
    CONSTRAINT alarm_occurrences_ticket FOREIGN KEY (ticket_id) REFERENCES tickets(id)
  ) ${tail}`);

  // Per tool: the default rule for its alarms, the chattering thresholds and the flood state.
  await q(`CREATE TABLE alarm_tool_settings (
    tool_id INT UNSIGNED PRIMARY KEY,
    default_rule ${rule} NULL,
    chatter_count TINYINT UNSIGNED NOT NULL DEFAULT 3,
    chatter_window_s INT UNSIGNED NOT NULL DEFAULT 60,
    flood_started_at DATETIME(3) NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY alarm_tool_settings_flood (flood_started_at),
    CONSTRAINT alarm_tool_settings_tool FOREIGN KEY (tool_id) REFERENCES tools(id)
  ) ${tail}`);

  // Facility-wide rule per SEMI E5 category (0: the tool did not say).
  await q(`CREATE TABLE alarm_category_rules (
    category TINYINT UNSIGNED PRIMARY KEY,
    rule ${rule} NOT NULL,
    updated_at DATETIME(3) NOT NULL
  ) ${tail}`);
  for (const [category, r] of Object.entries(DEFAULT_CATEGORY_RULES)) {
    await qi.sequelize.query(
      `INSERT IGNORE INTO alarm_category_rules (category, rule, updated_at) VALUES (:category, :rule, UTC_TIMESTAMP(3))`,
      {
        replacements: { category: Number(category), rule: r },
      },
    );
  }

  // Usage counters (cumulative). A reading lower than the one before it in time is a reset.
  // Resets are rare: counter_readings_resets lets running totals (maintenance plans) read only those rows.
  await q(`CREATE TABLE counter_readings (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    sender_id VARCHAR(100) NOT NULL,
    counter VARCHAR(40) NOT NULL,
    value DOUBLE NOT NULL,
    at DATETIME(3) NOT NULL,
    is_reset BOOLEAN NOT NULL DEFAULT FALSE,
    received_at DATETIME(3) NOT NULL,
    UNIQUE KEY counter_readings_sender (tool_id, sender_id),
    KEY counter_readings_series (tool_id, counter, at, id),
    KEY counter_readings_resets (is_reset, tool_id, counter),
    CONSTRAINT counter_readings_tool FOREIGN KEY (tool_id) REFERENCES tools(id)
  ) ${tail}`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of [
    'counter_readings',
    'alarm_category_rules',
    'alarm_tool_settings',
    'alarm_occurrences',
    'alarm_events',
    'alarm_definitions',
    'tool_keys',
  ]) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
