import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { createSequelize, createMigrator } from '../../server/db';
import { testConfig, projectRoot } from '../support/env';

const source = `faultline_backup_src_${process.pid}`;
const target = `faultline_backup_dst_${process.pid}`;
const file = path.join(projectRoot, 'test-results', `${source}.sql.gz`);
const admin = createSequelize({ ...testConfig(), DB_NAME: 'information_schema' }, { bindModels: false });

afterAll(async () => {
  await admin.query(`DROP DATABASE IF EXISTS \`${source}\``);
  await admin.query(`DROP DATABASE IF EXISTS \`${target}\``);
  await admin.close();
  fs.rmSync(file, { force: true });
});

describe('backup and restore', () => {
  it('when a database is backed up with the script and restored elsewhere, then its rows come back intact', async () => {
    await admin.query(`CREATE DATABASE \`${source}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    const db = createSequelize({ ...testConfig(), DB_NAME: source }, { bindModels: false });
    await createMigrator(db).up();
    await db.query(
      `INSERT INTO users (email, name, role, created_at, updated_at) VALUES ('kept@test.faultline.test', 'Zoë Überprüfung', 'member', NOW(3), NOW(3))`,
    );
    await db.close();

    fs.mkdirSync(path.dirname(file), { recursive: true });
    execFileSync('bash', [path.join(projectRoot, 'scripts/db-backup.sh'), source, file]);
    expect(fs.statSync(file).size).toBeGreaterThan(500);
    execFileSync('bash', [path.join(projectRoot, 'scripts/db-restore.sh'), file, target]);

    const restored = createSequelize({ ...testConfig(), DB_NAME: target }, { bindModels: false });
    const rows = await restored.query<{ name: string }>(`SELECT name FROM users WHERE email = 'kept@test.faultline.test'`, {
      type: QueryTypes.SELECT,
    });
    const migrations = await restored.query<{ n: number }>('SELECT COUNT(*) AS n FROM schema_migrations', { type: QueryTypes.SELECT });
    await restored.close();
    expect(rows).toEqual([{ name: 'Zoë Überprüfung' }]);
    expect(Number(migrations[0].n)).toBeGreaterThanOrEqual(3);
  });
});
