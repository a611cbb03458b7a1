// npm test starts from an empty test database so every run begins in the same state.
import { createSequelize } from '../server/db';
import { testConfig } from '../tests/support/env';

const admin = createSequelize({ ...testConfig(), DB_NAME: 'information_schema' }, { bindModels: false });
await admin.query('DROP DATABASE IF EXISTS faultline_test');
await admin.query('CREATE DATABASE faultline_test CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci');
await admin.close();
