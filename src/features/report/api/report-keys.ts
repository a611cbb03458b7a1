/**
 * The report form's open-tickets list sits under the tickets list prefix, so the socket's
 * 'ticket.created' / 'ticket.updated' invalidation of ['tickets', 'list'] refreshes it too.
 */
export const reportKeys = {
  toolChoices: (q: { code?: string; q?: string; id?: number }) => ['report', 'tool-choices', q] as const,
  openTickets: (toolId: number) => ['tickets', 'list', 'report-open', toolId] as const,
};
