import { createSequelize, createMigrator } from '../../server/db';
import { testConfig } from './env';

/**
 * Once per test run: the test database exists and is fully migrated. `npm test` starts from an
 * empty one (scripts/reset-test-db.ts); a developer's repeated runs keep it, which is safe
 * because every test makes its own uniquely named rows.
 */
export default async function setup() {
  const config = testConfig();
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' }, { bindModels: false });
  await admin.query('CREATE DATABASE IF NOT EXISTS faultline_test CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  await sequelize.close();
}
