import type { Transaction } from 'sequelize';
import type { AppDeps } from '../../lib/http';
import { announceBoardTools } from '../facility/board.service';

/**
 * A tool's alarms changed: pages that show alarms refetch them ('alarm.changed' carries ids
 * only), and the tool's board entry (its active-alarm line) travels to every board with the
 * board change, so open boards need no refetch.
 */
export function announceAlarmChange(deps: AppDeps, toolId: number, transaction?: Transaction | null) {
  deps.events.publish({ type: 'alarm.changed', audience: 'all', payload: { id: toolId, toolId } }, transaction);
  announceBoardTools(deps, [toolId], transaction);
}
