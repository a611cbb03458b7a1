import type { QueryInterface } from 'sequelize';

// One row (id = 1) of facility-wide settings. No row means "not set yet": the service answers
// with defaults (the time zone from FACILITY_TIME_ZONE) until an admin saves the form.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`CREATE TABLE facility_settings (
    id TINYINT UNSIGNED PRIMARY KEY,
    facility_name VARCHAR(120) NOT NULL,
    time_zone VARCHAR(64) NOT NULL,
    emergency_number VARCHAR(40) NOT NULL DEFAULT '',
    local_procedure TEXT NOT NULL,
    member_ticket_visibility ENUM('all','own') NOT NULL DEFAULT 'all',
    updated_by_id INT UNSIGNED NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT facility_settings_one_row CHECK (id = 1),
    CONSTRAINT facility_settings_updated_by FOREIGN KEY (updated_by_id) REFERENCES users(id) ON DELETE SET NULL
  ) ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('DROP TABLE facility_settings');
}
