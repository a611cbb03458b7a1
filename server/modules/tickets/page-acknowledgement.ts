import type { Transaction } from 'sequelize';
import { Ticket } from './ticket.model';
import { User } from '../users/user.model';
import { appendEvent } from './ticket-effects';
import type { AppDeps } from '../../lib/http';

/**
 * The on-call module's way onto a ticket's timeline (other modules change tickets only
 * through the tickets module): a page was acknowledged. A ticket still at Reported is
 * acknowledged with it, by the person who answered the page, as if they had pressed the
 * ticket's own button; either way the timeline says who answered, how and when.
 */
export async function recordPageAcknowledged(
  deps: AppDeps,
  input: { ticketId: number; userId: number; via: 'link' | 'sms' | 'app'; step: string; at: Date },
  transaction: Transaction,
) {
  const ticket = await Ticket.findByPk(input.ticketId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!ticket) return;
  const person = await User.findByPk(input.userId, { attributes: ['id', 'name'], transaction });
  await appendEvent(
    ticket.id,
    input.userId,
    'page_acknowledged',
    { data: { via: input.via, step: input.step }, at: input.at },
    transaction,
  );
  if (ticket.status === 'reported') {
    ticket.status = 'acknowledged';
    ticket.acknowledgedAt = input.at;
    if (ticket.assigneeId === null && person) {
      ticket.assigneeId = person.id;
      await appendEvent(
        ticket.id,
        person.id,
        'assignment',
        { data: { from: null, to: { id: person.id, name: person.name }, automatic: true }, at: input.at },
        transaction,
      );
    }
    await appendEvent(
      ticket.id,
      input.userId,
      'status',
      { data: { action: 'acknowledge', from: 'reported', to: 'acknowledged', via: 'page' }, at: input.at },
      transaction,
    );
  }
  // The version moves on, so a technician's stale save of the same ticket is caught (409).
  ticket.changed('updatedAt', true);
  await ticket.save({ transaction });
  deps.events.publish(
    { type: 'ticket.updated', audience: { ticket: ticket.id }, payload: { id: ticket.id, toolId: ticket.toolId } },
    transaction,
  );
}
