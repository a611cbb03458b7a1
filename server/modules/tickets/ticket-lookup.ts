import { Ticket } from './ticket.model';

// What other modules may ask of the tickets module directly.

/** The tool a ticket is about, or null when there is no such ticket. */
export async function ticketToolId(ticketId: number): Promise<number | null> {
  const ticket = await Ticket.findByPk(ticketId, { attributes: ['toolId'] });
  return ticket ? ticket.toolId : null;
}
