// Seeds the demo facility into an empty database (DB_NAME); does nothing when data exists.
import { loadConfig } from '../server/config';
import { createSequelize } from '../server/db';
import { seedDemo } from '../server/db/seed';

const config = loadConfig(process.env, { SESSION_SECRET: process.env.SESSION_SECRET ?? 'x'.repeat(32) });
const sequelize = createSequelize(config);
try {
  const started = Date.now();
  const { seeded } = await seedDemo(sequelize);
  console.log(
    seeded
      ? `• Seeded the demo facility in ${((Date.now() - started) / 1000).toFixed(1)} s.`
      : '• Data already present; demo seed skipped.',
  );
} finally {
  await sequelize.close();
}
