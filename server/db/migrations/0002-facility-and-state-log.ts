import type { QueryInterface } from 'sequelize';
import { E10_STATES, STATE_REASONS } from '../../../shared/equipment-state';

const list = (xs: readonly string[]) => xs.map((x) => `'${x}'`).join(',');

export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE areas (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(120) NOT NULL,
    code VARCHAR(24) NOT NULL,
    description TEXT NULL,
    sort_order INT NOT NULL DEFAULT 0,
    retired_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY areas_code (code),
    UNIQUE KEY areas_name (name)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE tools (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    area_id INT UNSIGNED NOT NULL,
    name VARCHAR(120) NOT NULL,
    code VARCHAR(32) NOT NULL,
    description TEXT NULL,
    criticality ENUM('high','normal','low') NOT NULL DEFAULT 'normal',
    primary_engineer_id INT UNSIGNED NULL,
    backup_engineer_id INT UNSIGNED NULL,
    retired_at DATETIME(3) NULL,
    version INT UNSIGNED NOT NULL DEFAULT 0,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY tools_code (code),
    KEY tools_area (area_id),
    CONSTRAINT tools_area FOREIGN KEY (area_id) REFERENCES areas(id),
    CONSTRAINT tools_primary FOREIGN KEY (primary_engineer_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT tools_backup FOREIGN KEY (backup_engineer_id) REFERENCES users(id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE modules (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    name VARCHAR(120) NOT NULL,
    code VARCHAR(32) NOT NULL,
    sort_order INT NOT NULL DEFAULT 0,
    retired_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY modules_tool_code (tool_id, code),
    CONSTRAINT modules_tool FOREIGN KEY (tool_id) REFERENCES tools(id)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // The state log: per tool (module_id NULL) and per module, a sequence of intervals with no
  // gaps and no overlaps. The generated open_flag is 1 only for the open interval (ended_at
  // NULL) and NULL otherwise, so the unique key allows exactly one open interval per
  // tool/module while closed ones never collide.
  await q(`CREATE TABLE state_intervals (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    tool_id INT UNSIGNED NOT NULL,
    module_id INT UNSIGNED NULL,
    module_key INT UNSIGNED AS (COALESCE(module_id, 0)) PERSISTENT,
    state ENUM(${list(E10_STATES)}) NOT NULL,
    reason ENUM(${list(STATE_REASONS)}) NOT NULL DEFAULT 'none',
    note VARCHAR(500) NULL,
    started_at DATETIME(3) NOT NULL,
    ended_at DATETIME(3) NULL,
    open_flag TINYINT AS (IF(ended_at IS NULL, 1, NULL)) PERSISTENT,
    expected_return_at DATETIME(3) NULL,
    ticket_id INT UNSIGNED NULL,
    set_by_id INT UNSIGNED NULL,
    source ENUM('staff','user_report','alarm','schedule','system') NOT NULL DEFAULT 'staff',
    confirmed BOOLEAN NOT NULL DEFAULT TRUE,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY state_one_open (tool_id, module_key, open_flag),
    KEY state_tool_time (tool_id, module_key, started_at),
    KEY state_period (module_key, started_at, ended_at),
    CONSTRAINT state_tool FOREIGN KEY (tool_id) REFERENCES tools(id),
    CONSTRAINT state_module FOREIGN KEY (module_id) REFERENCES modules(id),
    CONSTRAINT state_set_by FOREIGN KEY (set_by_id) REFERENCES users(id) ON DELETE SET NULL,
    CONSTRAINT state_interval_order CHECK (ended_at IS NULL OR ended_at >= started_at)
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  await q(`CREATE TABLE tool_follows (
    user_id INT UNSIGNED NOT NULL,
    tool_id INT UNSIGNED NOT NULL,
    unfollow_token CHAR(43) NOT NULL,
    created_at DATETIME(3) NOT NULL,
    PRIMARY KEY (user_id, tool_id),
    UNIQUE KEY tool_follows_token (unfollow_token),
    KEY tool_follows_tool (tool_id),
    CONSTRAINT tool_follows_user FOREIGN KEY (user_id) REFERENCES users(id) ON DELETE CASCADE,
    CONSTRAINT tool_follows_tool FOREIGN KEY (tool_id) REFERENCES tools(id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // In-app notices, pushed over websockets and listed in the app.
  await q(`CREATE TABLE notices (
    id BIGINT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    user_id INT UNSIGNED NOT NULL,
    kind VARCHAR(40) NOT NULL,
    title VARCHAR(200) NOT NULL,
    body TEXT NULL,
    link VARCHAR(300) NULL,
    read_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    KEY notices_user (user_id, created_at),
    CONSTRAINT notices_user FOREIGN KEY (user_id) REFERENCES users(id) ON DELETE CASCADE
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);

  // Lobby display links: a long random key, stored only as its SHA-256.
  await q(`CREATE TABLE display_links (
    id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY,
    name VARCHAR(120) NOT NULL,
    key_hash CHAR(64) NOT NULL,
    created_by_id INT UNSIGNED NULL,
    revoked_at DATETIME(3) NULL,
    last_seen_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY display_links_key (key_hash),
    CONSTRAINT display_links_creator FOREIGN KEY (created_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['display_links', 'notices', 'tool_follows', 'state_intervals', 'modules', 'tools', 'areas']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
