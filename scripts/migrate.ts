// Runs pending migrations against the database named by the environment (DB_NAME).
import { loadConfig } from '../server/config';
import { createSequelize, createMigrator } from '../server/db';

const config = loadConfig(process.env, { SESSION_SECRET: process.env.SESSION_SECRET ?? 'x'.repeat(32) });
const sequelize = createSequelize(config);
try {
  const done = await createMigrator(sequelize).up();
  console.log(done.length ? `• Migrated ${config.DB_NAME}: ${done.map((m) => m.name).join(', ')}` : `• ${config.DB_NAME} is up to date.`);
} finally {
  await sequelize.close();
}
