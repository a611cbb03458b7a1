import { QueryTypes } from 'sequelize';
import { isStaff } from '../../../shared/roles';
import type { AppDeps, AuthUser } from '../../lib/http';
import { notFound } from '../../lib/errors';
import { getFacilitySettings } from '../settings/settings.service';

// Who may read which ticket. By default (an open facility) every signed-in user reads every
// ticket. A facility with paying outside users can set "members see only their own reports":
// then a member reads only the tickets they reported or added a report to (and the tickets
// those were merged into); the board still shows every tool. Staff always read everything.

/** Whether this viewer is limited to their own reports by the facility setting. */
export async function limitedToOwnReports(deps: AppDeps, user: AuthUser): Promise<boolean> {
  if (isStaff(user.role)) return false;
  return (await getFacilitySettings(deps)).memberTicketVisibility === 'own';
}

/** Refuses (404, as for a ticket that does not exist) a ticket this viewer may not read. */
export async function assertMayReadTicket(deps: AppDeps, user: AuthUser, ticketId: number): Promise<void> {
  if (!(await limitedToOwnReports(deps, user))) return;
  const [row] = await deps.sequelize.query<{ n: number }>(
    `SELECT COUNT(*) AS n FROM tickets t
      WHERE (t.id = :id OR t.merged_into_id = :id OR t.id = (SELECT merged_into_id FROM tickets WHERE id = :id))
        AND (t.reporter_id = :userId
             OR EXISTS (SELECT 1 FROM ticket_events e WHERE e.ticket_id = t.id AND e.kind = 'added_report' AND e.actor_id = :userId))`,
    { type: QueryTypes.SELECT, replacements: { id: ticketId, userId: user.id } },
  );
  if (!row || Number(row.n) === 0) throw notFound('That ticket');
}
