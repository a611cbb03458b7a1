import type { QueryInterface } from 'sequelize';
import { PRIORITIES, SERVICE_TARGET_DEFAULTS } from '../../../shared/priority';

// The service targets start from the shared defaults; managers change them afterwards. INSERT
// IGNORE keeps any row an admin already set, so running this on a live database is safe.
export async function up({ context: qi }: { context: QueryInterface }) {
  for (const priority of PRIORITIES) {
    const t = SERVICE_TARGET_DEFAULTS[priority];
    await qi.sequelize.query(
      `INSERT IGNORE INTO service_targets (priority, acknowledge_minutes, restore_minutes, created_at, updated_at)
       VALUES (:priority, :ack, :restore, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))`,
      { replacements: { priority, ack: t.acknowledgeMinutes, restore: t.restoreMinutes } },
    );
  }
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`DELETE FROM service_targets`);
}
