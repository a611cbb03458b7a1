import { ServiceTarget } from './ticket.model';
import type { AppDeps, AuthUser } from '../../lib/http';
import type { Priority } from '../../../shared/priority';
import { listServiceTargets } from './ticket-query.service';

/** Replaces the targets of one priority; open tickets' timers follow at their next read. */
export async function updateServiceTarget(
  deps: AppDeps,
  user: AuthUser,
  priority: Priority,
  input: { acknowledgeMinutes: number; restoreMinutes: number },
) {
  await deps.sequelize.transaction(async (transaction) => {
    const row = await ServiceTarget.findByPk(priority, { transaction, lock: transaction.LOCK.UPDATE });
    if (row) await row.update(input, { transaction });
    else await ServiceTarget.create({ priority, ...input }, { transaction });
    deps.log.info({ priority, ...input, userId: user.id }, 'service target changed');
    // Every queue's timers depend on the targets: let open queues refetch.
    deps.events.publish({ type: 'service_targets.updated', audience: 'all', payload: { priority } }, transaction);
  });
  return (await listServiceTargets()).find((t) => t.priority === priority)!;
}
