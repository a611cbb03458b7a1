import { Op, QueryTypes } from 'sequelize';
import { AlarmDefinition, AlarmToolSettings } from './alarms.model';
import type { AppDeps } from '../../lib/http';
import { tellToolEngineers } from '../tickets/alarm-tickets.service';
import { CHATTER_QUIET_MS, FLOOD_PERIOD_MS, FLOOD_THRESHOLD } from '../../../shared/alarms';
import { announceAlarmChange } from './announce';

// Background work of the alarms: a chattering alarm that has stayed clear for 10 minutes gets
// its one summary and loses the mark; a flood that has passed is closed. Rows are claimed with
// SELECT … FOR UPDATE SKIP LOCKED, so several server processes never send a summary twice.

export async function runAlarmSweep(deps: AppDeps, now = new Date()): Promise<{ summaries: number; floodsEnded: number }> {
  let summaries = 0;
  await deps.sequelize.transaction(async (transaction) => {
    const defs = await AlarmDefinition.findAll({
      where: { chatteringSince: { [Op.ne]: null } },
      limit: 50,
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    for (const def of defs) {
      const [row] = await deps.sequelize.query<{ active: number; lastClear: Date | null; sets: number }>(
        `SELECT SUM(cleared_at IS NULL) AS active, MAX(cleared_at) AS lastClear, SUM(set_at >= :since) AS sets FROM alarm_occurrences WHERE definition_id = :id AND set_at >= :since`,
        { replacements: { id: def.id, since: def.chatteringSince }, type: QueryTypes.SELECT, transaction },
      );
      if (Number(row.active) > 0) continue;
      if (row.lastClear && new Date(row.lastClear).getTime() > now.getTime() - CHATTER_QUIET_MS) continue;
      const since = def.chatteringSince!;
      await tellToolEngineers(
        deps,
        {
          toolId: def.toolId,
          kind: 'alarm.chatter_summary',
          title: `Chattering alarm ${def.alarmKey} has settled: ${def.text}`,
          text: [
            `Alarm ${def.alarmKey} (${def.text}) chattered: it set ${Number(row.sets)} times from ${since.toISOString()} to ${row.lastClear ? new Date(row.lastClear).toISOString() : 'now'}.`,
            `Its notices were held back${def.heldCount ? ` (${def.heldCount} held)` : ''}; it has now stayed clear for ${CHATTER_QUIET_MS / 60_000} minutes.`,
            'A chattering alarm often points at a sensor or a limit set too close to normal operation.',
          ].join('\n'),
        },
        transaction,
      );
      await def.update({ chatteringSince: null, heldCount: 0 }, { transaction });
      announceAlarmChange(deps, def.toolId, transaction);
      summaries++;
    }
  });

  let floodsEnded = 0;
  await deps.sequelize.transaction(async (transaction) => {
    const floods = await AlarmToolSettings.findAll({
      where: { floodStartedAt: { [Op.ne]: null } },
      limit: 100,
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    for (const s of floods) {
      const [row] = await deps.sequelize.query<{ n: number }>(
        `SELECT COUNT(*) AS n FROM alarm_occurrences WHERE tool_id = :toolId AND set_at > :from`,
        {
          replacements: { toolId: s.toolId, from: new Date(now.getTime() - FLOOD_PERIOD_MS) },
          type: QueryTypes.SELECT,
          transaction,
        },
      );
      if (Number(row.n) <= FLOOD_THRESHOLD) {
        await s.update({ floodStartedAt: null }, { transaction });
        floodsEnded++;
      }
    }
  });
  return { summaries, floodsEnded };
}

/** Runs the sweep every `pollMs` in this process; passes never overlap. */
export class AlarmSweeper {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;

  constructor(
    private deps: AppDeps,
    private pollMs = 30_000,
  ) {}

  start() {
    if (this.timer) return;
    this.timer = setInterval(() => {
      if (this.running) return;
      this.running = runAlarmSweep(this.deps)
        .catch((error) => this.deps.log.warn({ err: String(error) }, 'alarm sweep failed'))
        .finally(() => (this.running = null));
    }, this.pollMs);
    this.timer.unref();
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }
}
