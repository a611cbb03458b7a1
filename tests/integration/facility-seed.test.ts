import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { createSequelize } from '../../server/db';
import { seedFacility, type FacilitySeed } from '../../server/db/seed/facility';
import { createUser } from '../support/factories';
import { testConfig } from '../support/env';
import type { User } from '../../server/modules/users/user.model';

// The demo seed runs inside a transaction that is rolled back, so the shared test database
// never keeps the demo's fixed codes.

let sequelize: Sequelize;
let staff: User[];
let members: User[];

beforeAll(async () => {
  sequelize = createSequelize(testConfig());
  staff = await Promise.all([1, 2, 3, 4, 5].map(() => createUser('technician')));
  members = await Promise.all([1, 2, 3].map(() => createUser('member')));
});
afterAll(() => sequelize.close());

class Rollback extends Error {}

async function seededThenRolledBack<T>(now: Date, inspect: (seed: FacilitySeed, t: Transaction) => Promise<T>): Promise<T> {
  let out: T | undefined;
  await sequelize
    .transaction(async (t) => {
      const seed = await seedFacility(t, { staff, members }, now);
      out = await inspect(seed, t);
      throw new Rollback();
    })
    .catch((e) => {
      if (!(e instanceof Rollback)) throw e;
    });
  return out!;
}

const rows = <T extends object>(t: Transaction, sql: string, replacements: Record<string, unknown>) =>
  sequelize.query<T>(sql, { type: QueryTypes.SELECT, transaction: t, replacements });

describe('the demo facility seed', () => {
  it('when seeded, then 40 tools in 6 areas get a gap-free year of history, with some tools in trouble now', async () => {
    const now = new Date('2026-06-15T10:00:00.000Z');
    await seededThenRolledBack(now, async (seed, t) => {
      expect(seed.areas).toHaveLength(6);
      expect(seed.tools).toHaveLength(40);
      expect(seed.facilityName).toMatch(/fictional/);
      expect(
        seed.tools.every((tool) => tool.primaryEngineerId && tool.backupEngineerId && tool.primaryEngineerId !== tool.backupEngineerId),
      ).toBe(true);
      expect(seed.tools.filter((tool) => tool.modules.length > 0).length).toBeGreaterThanOrEqual(5);
      const ids = seed.tools.map((tool) => tool.id);

      // The log invariant, for every tool and module: one open interval, each start = previous end.
      const open = await rows<{ n: number }>(t, `SELECT COUNT(*) AS n FROM state_intervals WHERE tool_id IN (:ids) AND ended_at IS NULL`, {
        ids,
      });
      const logs = await rows<{ n: number }>(
        t,
        `SELECT COUNT(DISTINCT tool_id, module_key) AS n FROM state_intervals WHERE tool_id IN (:ids)`,
        { ids },
      );
      expect(Number(open[0].n)).toBe(Number(logs[0].n));
      expect(Number(logs[0].n)).toBe(40 + seed.tools.reduce((n, tool) => n + tool.modules.length, 0));
      const gaps = await rows<{ n: number }>(
        t,
        `SELECT COUNT(*) AS n FROM (
           SELECT started_at, LAG(ended_at) OVER (PARTITION BY tool_id, module_key ORDER BY started_at, id) AS prev_end,
                  ROW_NUMBER() OVER (PARTITION BY tool_id, module_key ORDER BY started_at, id) AS k
             FROM state_intervals WHERE tool_id IN (:ids)) x
          WHERE k > 1 AND (prev_end IS NULL OR prev_end <> started_at)`,
        { ids },
      );
      expect(Number(gaps[0].n)).toBe(0);
      const span = await rows<{ first: Date }>(t, `SELECT MIN(started_at) AS first FROM state_intervals WHERE tool_id IN (:ids)`, { ids });
      expect(now.getTime() - span[0].first.getTime()).toBeGreaterThanOrEqual(364 * 86_400_000);

      // Every kind of time a year brings.
      const kinds = await rows<{ state: string; reason: string }>(
        t,
        `SELECT DISTINCT state, reason FROM state_intervals WHERE tool_id IN (:ids) AND module_id IS NULL`,
        { ids },
      );
      const has = (state: string, reason?: string) => kinds.some((k) => k.state === state && (!reason || k.reason === reason));
      expect(has('unscheduled_downtime', 'repair')).toBe(true);
      expect(has('unscheduled_downtime', 'waiting_parts')).toBe(true);
      expect(has('scheduled_downtime', 'preventive_maintenance')).toBe(true);
      expect(has('engineering')).toBe(true);
      expect(has('standby')).toBe(true);
      expect(has('productive')).toBe(true);
      expect(has('non_scheduled')).toBe(true);

      // Right now: some Down, some in maintenance, some Limited (by a module or a restriction).
      const current = await rows<{ code: string; state: string; restriction: string | null; module_id: number | null }>(
        t,
        `SELECT tl.code, s.state, s.restriction, s.module_id FROM state_intervals s JOIN tools tl ON tl.id = s.tool_id WHERE s.tool_id IN (:ids) AND s.ended_at IS NULL`,
        { ids },
      );
      const toolNow = current.filter((c) => c.module_id === null);
      expect(toolNow.filter((c) => c.state === 'unscheduled_downtime').length).toBeGreaterThanOrEqual(3);
      expect(toolNow.some((c) => c.state === 'scheduled_downtime')).toBe(true);
      expect(toolNow.some((c) => c.restriction)).toBe(true);
      expect(current.some((c) => c.module_id !== null && c.state === 'unscheduled_downtime')).toBe(true);
    });
  });

  it('when seeded twice for the same moment, then the history is identical (a fixed random seed)', async () => {
    const now = new Date('2026-03-02T08:30:00.000Z');
    const signature = (t: Transaction, seed: FacilitySeed) =>
      rows<{ s: string }>(
        t,
        `SELECT GROUP_CONCAT(CONCAT_WS('|', tl.code, COALESCE(m.code, '-'), s.state, s.reason, COALESCE(s.note, ''), s.started_at) ORDER BY tl.code, s.module_key, s.started_at SEPARATOR '\n') AS s
           FROM state_intervals s JOIN tools tl ON tl.id = s.tool_id LEFT JOIN modules m ON m.id = s.module_id WHERE s.tool_id IN (:ids)`,
        { ids: seed.tools.map((tool) => tool.id) },
      );
    await sequelize.query('SET SESSION group_concat_max_len = 100000000');
    const hash = (s: string) => crypto.createHash('sha256').update(s).digest('hex');
    const first = await seededThenRolledBack(now, async (seed, t) => {
      await sequelize.query('SET SESSION group_concat_max_len = 100000000', { transaction: t });
      return hash((await signature(t, seed))[0].s);
    });
    const second = await seededThenRolledBack(now, async (seed, t) => {
      await sequelize.query('SET SESSION group_concat_max_len = 100000000', { transaction: t });
      return hash((await signature(t, seed))[0].s);
    });
    expect(first).toBe(second);
  });
});
