import type { QueryInterface } from 'sequelize';

// Mail is no longer given up after a number of attempts: it is retried with a capped back-off
// until it goes out, and admins are told (once per mail, `warned_at`) when one is late. Mail
// parked as 'dead' by earlier versions is put back in the queue, due now.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE outbox_mails ADD COLUMN warned_at DATETIME(3) NULL AFTER sent_at`);
  await qi.sequelize.query(`UPDATE outbox_mails SET status = 'pending', next_attempt_at = UTC_TIMESTAMP(3) WHERE status = 'dead'`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE outbox_mails DROP COLUMN warned_at`);
}
