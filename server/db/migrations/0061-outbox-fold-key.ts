import type { QueryInterface } from 'sequelize';

// Mail about one ticket to one person within a few minutes folds into one message: the first
// mail waits in the outbox for the fold window, and later ones are appended to it.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('ALTER TABLE outbox_mails ADD COLUMN fold_key VARCHAR(120) NULL, ADD KEY outbox_fold (fold_key, status)');
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('ALTER TABLE outbox_mails DROP KEY outbox_fold, DROP COLUMN fold_key');
}
