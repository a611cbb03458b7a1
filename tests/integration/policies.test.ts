import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from '../support/server';
import { createUser, signedInClient } from '../support/factories';
import type { TestClient } from '../support/client';
import { Ticket, UNWORKED_TICKET_FIELDS } from '../../server/modules/tickets/ticket.model';
import { changeState } from '../../server/modules/facility/state.service';
import { ALL_TICKET_ACTIONS, type TicketActionName } from '../../server/modules/tickets/ticket.policy';
import { TICKET_STATUSES, RESOLVED_STATUSES, type TicketStatus } from '../../shared/ticket-workflow';
import { makeTool, intervalsOf } from './facility-fixtures';
import { Tool } from '../../server/modules/facility/facility.model';
import { User } from '../../server/modules/users/user.model';
import { ROLES } from '../../shared/roles';
import { drainOutbox } from './tickets-fixtures';

// The allowed actions sent with a ticket, a tool or an account are exactly the requests the
// server accepts. For tickets: every role, every status, with and without a reported Down
// waiting for confirmation, each action tried for real. Accepted means 2xx; refused means 403
// or 409 and no change.

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await drainOutbox(server);
  await server.close();
});

type Actor = 'reporter (member)' | 'other member' | 'technician' | 'manager' | 'admin';
const ACTORS: Actor[] = ['reporter (member)', 'other member', 'technician', 'manager', 'admin'];

interface Setup {
  ticketId: number;
  /** An open ticket on the same tool, to merge into. */
  otherId: number;
}

/** A ticket straight in the database in `status`, optionally holding a reported Down of its tool. */
async function ticketIn(tool: { id: number }, status: TicketStatus, reporterId: number, reportedDown: boolean): Promise<Setup> {
  const resolved = (RESOLVED_STATUSES as readonly TicketStatus[]).includes(status);
  const report = (fields: Partial<Parameters<typeof Ticket.create>[0]>) =>
    Ticket.create({
      ...UNWORKED_TICKET_FIELDS,
      toolId: tool.id,
      moduleId: null,
      category: 'alarm_interlock',
      title: 'Chamber pressure alarm',
      description: 'Chamber pressure alarm and the process stopped mid-run',
      alarmText: null,
      impact: 'still_usable',
      hazards: [],
      wafersOwner: null,
      wafersRecoverable: null,
      priority: 'P3',
      reporterId,
      assigneeId: null,
      ...fields,
    });
  const other = await report({ title: 'Another report on the same tool' });
  const ticket = await report({
    impact: reportedDown ? 'tool_stopped' : 'still_usable',
    status,
    // Resolved an hour ago: inside the reporter's reopen window.
    resolvedAt: resolved ? new Date(Date.now() - 3600_000) : null,
    mergedIntoId: status === 'merged' ? other.id : null,
  });
  if (reportedDown) {
    await changeState(server.deps, {
      toolId: tool.id,
      state: 'unscheduled_downtime',
      reason: 'repair',
      note: 'Reported by a user',
      ticketId: ticket.id,
      source: 'user_report',
      confirmed: false,
      actorId: reporterId,
    });
  }
  return { ticketId: ticket.id, otherId: other.id };
}

/** A valid request for each action, so that only the policy can refuse it. */
async function attempt(client: TestClient, setup: Setup, action: TicketActionName, version: number, staffId: number) {
  const id = setup.ticketId;
  switch (action) {
    case 'comment':
      return client.post(`/api/tickets/${id}/comments`, { body: 'Still seeing it this morning.', internal: false });
    case 'note':
      return client.post(`/api/tickets/${id}/comments`, { body: 'Seal kit is on the shelf.', internal: true });
    case 'add_report':
      return client.post(`/api/tickets/${id}/reports`, { description: 'Same alarm on my run', hazards: [], wafersCount: 0 });
    default: {
      const bodies: Partial<Record<TicketActionName, Record<string, unknown>>> = {
        wait: { waitReason: 'parts' },
        fix: { fixKind: 'failure', workDone: 'Replaced the door seal' },
        reopen: { reason: 'The alarm came back' },
        no_fault_found: { note: 'Ran three test wafers without a fault' },
        merge: { targetId: setup.otherId },
        assign: { assigneeId: staffId },
        set_priority: { priority: 'P2', reason: 'Two groups are waiting' },
        set_state: { state: 'standby' },
        revert_down: { note: 'Runs fine' },
      };
      return client.post(`/api/tickets/${id}/actions`, { action, version, ...bodies[action] });
    }
  }
}

describe('ticket policy', () => {
  it('when every role tries every action on a ticket in every status, then the allowed actions sent with the ticket are exactly the accepted ones', async () => {
    const staff = await createUser('technician');
    const clients = new Map<Actor, { client: TestClient; id: number }>();
    for (const actor of ACTORS) {
      const role = actor === 'reporter (member)' || actor === 'other member' ? 'member' : actor;
      const { client, user } = await signedInClient(server.url, role);
      clients.set(actor, { client, id: user.id });
    }
    const reporterId = clients.get('reporter (member)')!.id;
    const mismatches: string[] = [];
    let accepted = 0;
    let refused = 0;

    // One actor's walk. The walks run one after another: state changes on different tools at
    // the same moment can deadlock in the state-log triggers, which is not what this checks.
    const walk = async (actor: Actor) => {
      const { client } = clients.get(actor)!;
      // One tool per walk: each new ticket takes its reported Down over from the one before.
      const { tool } = await makeTool(server.deps.sequelize, { since: new Date(Date.now() - 3 * 3600_000) });
      for (const status of TICKET_STATUSES) {
        for (const reportedDown of [false, true]) {
          const where = `${actor}, ${status}${reportedDown ? ', reported Down' : ''}`;
          let setup = await ticketIn(tool, status, reporterId, reportedDown);
          const detail = await client.get(`/api/tickets/${setup.ticketId}`);
          expect(detail.status, where).toBe(200);
          const shown = new Set<TicketActionName>(detail.body.allowedActions);
          let version: number = detail.body.version;
          for (const action of ALL_TICKET_ACTIONS) {
            const r = await attempt(client, setup, action, version, staff.id);
            const ok = r.status >= 200 && r.status < 300;
            if (ok) {
              accepted++;
              // The ticket changed: the next action starts again from the same situation.
              setup = await ticketIn(tool, status, reporterId, reportedDown);
              version = (await Ticket.findByPk(setup.ticketId))!.version;
            } else {
              refused++;
              if (r.status !== 403 && r.status !== 409) mismatches.push(`${where}: ${action} answered ${r.status} ${r.text}`);
              const after = await Ticket.findByPk(setup.ticketId);
              if (after!.version !== version) mismatches.push(`${where}: refused ${action} still changed the ticket`);
            }
            if (ok !== shown.has(action)) mismatches.push(`${where}: ${action} ${ok ? 'accepted but not shown' : 'shown but refused'}`);
          }
        }
      }
    };
    for (const actor of ACTORS) await walk(actor);
    expect(mismatches).toEqual([]);
    // Both sides of the table are exercised.
    expect(accepted).toBeGreaterThan(100);
    expect(refused).toBeGreaterThan(100);
  }, 600_000);
});

describe('tool policy', () => {
  it('when every role tries to change the state of a tool in service and of a retired one, then the tool page offers exactly what is accepted', async () => {
    const mismatches: string[] = [];
    for (const role of ROLES) {
      const { client } = await signedInClient(server.url, role);
      for (const retired of [false, true]) {
        const { tool } = await makeTool(server.deps.sequelize);
        if (retired) await Tool.update({ retiredAt: new Date() }, { where: { id: tool.id } });
        const detail = await client.get(`/api/tools/by-code/${tool.code}`);
        expect(detail.status).toBe(200);
        const logBefore = (await intervalsOf(tool.id)).length;
        const r = await client.post(`/api/tools/${tool.id}/state`, { state: 'engineering', note: 'Recipe trials' });
        const ok = r.status === 201;
        if (!ok && r.status !== 403 && r.status !== 409) mismatches.push(`${role}, retired ${retired}: answered ${r.status}`);
        if (!ok && (await intervalsOf(tool.id)).length !== logBefore) mismatches.push(`${role}, retired ${retired}: refused but logged`);
        if (ok !== detail.body.allowedActions.includes('change_state'))
          mismatches.push(`${role}, retired ${retired}: change_state ${ok ? 'accepted but not offered' : 'offered but refused'}`);
      }
    }
    expect(mismatches).toEqual([]);
  });
});

describe('user policy', () => {
  it('when an admin changes their own account and someone else’s, then the user list offers exactly the changes that are accepted', async () => {
    const { client: admin, user: me } = await signedInClient(server.url, 'admin');
    const changes: Record<string, (target: { role: string; active: boolean }) => Record<string, unknown>> = {
      rename: () => ({ name: 'Renamed person' }),
      change_role: (t) => ({ role: t.role === 'admin' ? 'technician' : 'admin' }),
      set_on_call: () => ({ onCall: true }),
      disable: () => ({ active: false }),
      enable: () => ({ active: true }),
    };
    const mismatches: string[] = [];
    for (const [action, body] of Object.entries(changes)) {
      for (const whose of ['own', 'other'] as const) {
        const target = whose === 'own' ? me : await createUser('technician');
        const fresh = (await User.findByPk(target.id))!;
        const list = await admin.get(`/api/users?q=${encodeURIComponent(fresh.email)}`);
        const listed = list.body.items.find((u: { id: number }) => u.id === fresh.id);
        const r = await admin.patch(`/api/users/${fresh.id}`, body(fresh));
        const ok = r.status === 200;
        if (!ok && r.status !== 409) mismatches.push(`${whose} account, ${action}: answered ${r.status}`);
        if (ok !== listed.allowedActions.includes(action))
          mismatches.push(`${whose} account, ${action}: ${ok ? 'accepted but not offered' : 'offered but refused'}`);
      }
    }
    expect(mismatches).toEqual([]);
  });
});
