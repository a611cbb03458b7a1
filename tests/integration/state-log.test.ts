import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { signedInClient } from '../support/factories';
import { changeState } from '../../server/modules/facility/state.service';
import { StateInterval } from '../../server/modules/facility/facility.model';
import type { DomainEvent } from '../../server/lib/events';
import { intervalsOf, logProblems, makeTool } from './facility-fixtures';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const STATES = ['productive', 'standby', 'engineering', 'scheduled_downtime', 'unscheduled_downtime', 'non_scheduled'] as const;

describe('the state log under concurrent changes', () => {
  it('when 20 technicians change the same tool at once over HTTP, then 21 intervals, each starting at the previous end, exactly one open', async () => {
    const { tool } = await makeTool(server.deps.sequelize);
    const { client, user } = await signedInClient(server.url, 'technician');
    const results = await Promise.all(
      Array.from({ length: 20 }, (_, i) => {
        const state = STATES[i % STATES.length];
        const running = state === 'productive' || state === 'standby';
        return client.post(`/api/tools/${tool.id}/state`, { state, note: running ? undefined : `Change number ${i}` });
      }),
    );
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));

    const log = await intervalsOf(tool.id);
    expect(log).toHaveLength(21);
    expect(logProblems(log)).toEqual([]);
    // Every change records who made it.
    expect(log.slice(1).every((i) => i.setById === user.id)).toBe(true);
  });

  it('when 20 service calls change a tool and its two modules at once, then every log (tool and each module) stays whole', async () => {
    const { tool, modules } = await makeTool(server.deps.sequelize, { modules: ['A', 'B'] });
    const targets = [null, modules[0].id, modules[1].id];
    await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        changeState(server.deps, { toolId: tool.id, moduleId: targets[i % 3], state: STATES[i % STATES.length], actorId: null }),
      ),
    );
    const logs = await Promise.all(targets.map((m) => intervalsOf(tool.id, m)));
    expect(logs.map((l) => l.length)).toEqual([1 + 7, 1 + 7, 1 + 6]);
    for (const log of logs) expect(logProblems(log)).toEqual([]);
    expect(await StateInterval.count({ where: { toolId: tool.id } })).toBe(3 + 20);
  });

  it('when the invariant checker meets a gap or two open intervals, then it reports them (the check itself can fail)', async () => {
    const a = StateInterval.build({
      toolId: 1,
      moduleId: null,
      state: 'standby',
      note: null,
      startedAt: new Date(0),
      endedAt: new Date(1000),
      expectedReturnAt: null,
      ticketId: null,
      setById: null,
    });
    const b = StateInterval.build({
      toolId: 1,
      moduleId: null,
      state: 'productive',
      note: null,
      startedAt: new Date(2000),
      endedAt: null,
      expectedReturnAt: null,
      ticketId: null,
      setById: null,
    });
    const c = StateInterval.build({
      toolId: 1,
      moduleId: null,
      state: 'productive',
      note: null,
      startedAt: new Date(2000),
      endedAt: null,
      expectedReturnAt: null,
      ticketId: null,
      setById: null,
    });
    expect(logProblems([a, b])).toHaveLength(1);
    expect(logProblems([a, b, c]).length).toBeGreaterThanOrEqual(2);
  });

  it('when a change succeeds, then the previous interval closes at the instant the new one opens and tool.state_changed goes to everyone after commit', async () => {
    const { tool } = await makeTool(server.deps.sequelize);
    const seen: DomainEvent[] = [];
    const stop = server.deps.events.subscribe((e) => seen.push(e));
    try {
      const result = await changeState(server.deps, {
        toolId: tool.id,
        state: 'unscheduled_downtime',
        reason: 'repair',
        note: 'Pump',
        actorId: null,
      });
      expect(result.previous?.state).toBe('standby');
      expect(result.previous?.endedAt?.getTime()).toBe(result.current.startedAt.getTime());
      expect(seen).toContainEqual({
        type: 'tool.state_changed',
        audience: 'all',
        payload: { toolId: tool.id, moduleId: null, state: 'unscheduled_downtime' },
      });
    } finally {
      stop();
    }
  });

  it('when a change fails inside its transaction, then nothing is written and no event goes out', async () => {
    const { tool } = await makeTool(server.deps.sequelize);
    const seen: DomainEvent[] = [];
    const stop = server.deps.events.subscribe((e) => seen.push(e));
    try {
      await expect(
        server.deps.sequelize.transaction(async (t) => {
          await changeState(server.deps, { toolId: tool.id, state: 'engineering', note: 'Qual', actorId: null }, t);
          throw new Error('boom');
        }),
      ).rejects.toThrow('boom');
      const log = await intervalsOf(tool.id);
      expect(log).toHaveLength(1);
      expect(log[0].endedAt).toBeNull();
      expect(seen.filter((e) => e.type === 'tool.state_changed')).toEqual([]);
    } finally {
      stop();
    }
  });
});
