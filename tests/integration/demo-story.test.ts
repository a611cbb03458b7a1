import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op, type Sequelize, type Transaction } from 'sequelize';
import { createSequelize } from '../../server/db';
import { seedFacility } from '../../server/db/seed/facility';
import { problemOf, seedTickets } from '../../server/db/seed/tickets';
import { StateInterval } from '../../server/modules/facility/facility.model';
import { Ticket, TicketEvent } from '../../server/modules/tickets/ticket.model';
import { isOpenStatus } from '../../shared/ticket-workflow';
import { createUser } from '../support/factories';
import { testConfig } from '../support/env';
import type { User } from '../../server/modules/users/user.model';

// The demo tells one story per tool: what the board says (state, reason, note, expected
// return) and what its open tickets say agree. The seed runs inside a transaction that is
// rolled back, so the shared test database never keeps the demo's fixed codes.

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

async function seededDemo(now: Date, inspect: (toolIds: number[], t: Transaction) => Promise<void>) {
  await sequelize
    .transaction(async (t) => {
      const facility = await seedFacility(t, { staff, members }, now);
      const toolIds = facility.tools.map((x) => x.id);
      await seedTickets(t, { staff, members }, now, { toolIds });
      await inspect(toolIds, t);
      throw new Rollback();
    })
    .catch((e) => {
      if (!(e instanceof Rollback)) throw e;
    });
}

// The ticket's wait reasons and the state reasons they hold the tool in (the workflow's table).
const WAIT_STATE: Record<string, string> = {
  parts: 'waiting_parts',
  vendor: 'maintenance_delay_supplier',
  user: 'maintenance_delay_user',
  facilities: 'facilities_related',
};

describe('the demo tells one story per tool', () => {
  it('when the demo is seeded, then every Down has an open ticket about what its board note says, waits agree with the board, and stopped or limited reports sit only where the board shows it', async () => {
    const now = new Date('2026-06-15T10:00:00.000Z');
    await seededDemo(now, async (toolIds, transaction) => {
      const open = await StateInterval.findAll({ where: { toolId: toolIds, endedAt: null }, transaction });
      const tickets = (await Ticket.findAll({ where: { toolId: toolIds }, transaction })).filter((k) => isOpenStatus(k.status));
      const byId = new Map(tickets.map((k) => [k.id, k]));
      const waits = await TicketEvent.findAll({
        where: { ticketId: tickets.map((k) => k.id), kind: 'status' },
        order: [['id', 'ASC']],
        transaction,
      });
      const lastWait = (ticketId: number) =>
        waits.filter((e) => e.ticketId === ticketId && (e.data as { action?: string } | null)?.action === 'wait').at(-1);

      // 1. Every tool or module in unscheduled downtime has one open ticket, linked from the
      //    state, on the same tool and module, whose title names the problem the note names.
      const downs = open.filter((iv) => iv.state === 'unscheduled_downtime');
      expect(downs.length).toBeGreaterThanOrEqual(5);
      for (const iv of downs) {
        const ticket = iv.ticketId ? byId.get(iv.ticketId) : undefined;
        expect(ticket, `open ticket for the Down of tool ${iv.toolId} module ${iv.moduleId}`).toBeDefined();
        expect(ticket!.toolId).toBe(iv.toolId);
        expect(ticket!.moduleId).toBe(iv.moduleId);
        const problem = problemOf(iv.note);
        expect(problem, `the board note of tool ${iv.toolId} names a problem`).toBeTruthy();
        expect(ticket!.title.toLowerCase()).toContain(problem!.toLowerCase());
        // A Down only a user has reported is not yet picked up; a confirmed one is.
        if (iv.source === 'user_report' && !iv.confirmed) expect(ticket!.status).toBe('reported');
        else expect(ticket!.status).not.toBe('reported');

        // 2. A state that waits is held by a waiting ticket that says the same: what for,
        //    the note, and the expected return the board shows.
        const waitReason = Object.entries(WAIT_STATE).find(([, r]) => r === iv.reason)?.[0];
        if (waitReason) {
          expect(ticket!.status).toBe('waiting');
          expect(ticket!.waitReason).toBe(waitReason);
          const event = lastWait(ticket!.id)!;
          expect(event.body).toBe(iv.note);
          expect((event.data as { expectedReturnAt: string | null }).expectedReturnAt).toBe(iv.expectedReturnAt?.toISOString() ?? null);
        } else {
          expect(ticket!.status).not.toBe('waiting');
        }
      }
      expect(downs.some((iv) => iv.reason === 'waiting_parts')).toBe(true);
      expect(downs.some((iv) => iv.moduleId !== null)).toBe(true);
      expect(downs.some((iv) => iv.source === 'user_report' && !iv.confirmed)).toBe(true);

      // 3. A waiting ticket holds the tool in the matching waiting state.
      for (const k of tickets.filter((x) => x.status === 'waiting')) {
        const held = open.find((iv) => iv.ticketId === k.id);
        expect(held?.reason, `ticket #${k.id} waits for ${k.waitReason}`).toBe(WAIT_STATE[k.waitReason!]);
      }

      // 4. A restriction in force is held by an open "tool limited" ticket that names it.
      const restricted = open.filter((iv) => iv.moduleId === null && iv.restriction);
      expect(restricted.length).toBeGreaterThanOrEqual(1);
      for (const iv of restricted) {
        const ticket = iv.ticketId ? byId.get(iv.ticketId) : undefined;
        expect(ticket?.impact).toBe('tool_limited');
        expect(ticket!.title.toLowerCase()).toContain(iv.restriction!.toLowerCase());
      }

      // 5. Stopped and limited reports sit only where the board shows a Down or a Limited: a
      //    tool Running without restriction, or in planned downtime, engineering or offline,
      //    has open tickets only for reports that did not stop it.
      for (const k of tickets) {
        const held = open.filter((iv) => iv.ticketId === k.id);
        if (k.impact === 'tool_stopped') {
          expect(held.map((iv) => [iv.moduleId, iv.state])).toEqual([[null, 'unscheduled_downtime']]);
        } else if (k.impact === 'tool_limited') {
          expect(held.length, `limited ticket #${k.id} holds a module Down or a restriction`).toBe(1);
          expect(held[0].moduleId !== null ? held[0].state : held[0].restriction).toBeTruthy();
        } else {
          expect(held).toEqual([]);
        }
      }
      const calm = open.filter((iv) => iv.moduleId === null && ['productive', 'standby'].includes(iv.state) && !iv.restriction);
      for (const iv of calm) {
        const modulesDown = open.some((m) => m.toolId === iv.toolId && m.moduleId !== null && m.state === 'unscheduled_downtime');
        if (modulesDown) continue;
        expect(tickets.filter((k) => k.toolId === iv.toolId && k.impact !== 'still_usable')).toEqual([]);
      }

      // 6. Each open ticket's story is in time order and ends in the status it shows.
      for (const k of tickets) {
        const steps = waits.filter((e) => e.ticketId === k.id);
        const times = steps.map((e) => e.createdAt.getTime());
        expect(times).toEqual([...times].sort((a, b) => a - b));
        expect(times.every((x) => x >= k.createdAt.getTime() && x <= now.getTime())).toBe(true);
        if (steps.length) expect((steps.at(-1)!.data as { to: string }).to).toBe(k.status);
        else expect(k.status).toBe('reported');
      }
      expect(await Ticket.count({ where: { toolId: toolIds, status: { [Op.in]: ['waiting'] } }, transaction })).toBeGreaterThanOrEqual(2);
    });
  });
});
