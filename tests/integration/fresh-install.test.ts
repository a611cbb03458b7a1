import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createSequelize, createMigrator } from '../../server/db';
import { testConfig } from '../support/env';

const name = `faultline_fresh_${process.pid}`;
const admin = createSequelize({ ...testConfig(), DB_NAME: 'information_schema' }, { bindModels: false });

afterAll(async () => {
  await admin.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await admin.close();
});

describe('fresh install', () => {
  it('when a new database is migrated without the demo seed, then there are no accounts at all, and migrations run down and up again cleanly', async () => {
    await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    // A raw connection (not the shared models) so this check cannot disturb other tests.
    const fresh = createSequelize({ ...testConfig(), DB_NAME: name }, { bindModels: false });
    try {
      const migrator = createMigrator(fresh);
      const applied = await migrator.up();
      expect(applied.length).toBeGreaterThanOrEqual(3);
      const [row] = await fresh.query<{ n: number }>('SELECT COUNT(*) AS n FROM users', { type: QueryTypes.SELECT });
      expect(Number(row.n)).toBe(0);
      await migrator.down({ to: 0 });
      const tables = await fresh.query<{ n: number }>(
        `SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = :name AND table_name <> 'schema_migrations'`,
        { type: QueryTypes.SELECT, replacements: { name } },
      );
      expect(Number(tables[0].n)).toBe(0);
      expect((await migrator.up()).length).toBe(applied.length);
    } finally {
      await fresh.close();
    }
  });
});
