import type { QueryInterface } from 'sequelize';

// A tool can be running yet restricted ("only 100 mm wafers", "no chlorine chemistry until
// the scrubber is back"): the board shows it as Limited. The restriction belongs to the
// interval, so the state log records when it was in force and why.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE state_intervals ADD COLUMN restriction VARCHAR(200) NULL AFTER note`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE state_intervals DROP COLUMN restriction`);
}
