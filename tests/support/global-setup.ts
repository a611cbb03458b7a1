import { createSequelize, createMigrator } from '../../server/db';
import { testConfig } from './env';

/** Once per test run: a fresh, fully migrated test database. */
export default async function setup() {
  const config = testConfig();
  const admin = createSequelize({ ...config, DB_NAME: 'information_schema' });
  await admin.query('DROP DATABASE IF EXISTS faultline_test');
  await admin.query('CREATE DATABASE faultline_test CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
  await admin.close();
  const sequelize = createSequelize(config);
  await createMigrator(sequelize).up();
  await sequelize.close();
}
