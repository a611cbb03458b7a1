import { describe, expect, it } from 'vitest';
import { withBoardChange } from '@/app/realtime';
import type { BoardData, BoardTool } from '@shared/schemas/facility';
import type { BoardToolChange } from '@shared/events';

const tool = (id: number, areaId: number, extra: Partial<BoardTool> = {}): BoardTool => ({
  id,
  code: `T-${id}`,
  name: `Tool ${id}`,
  areaId,
  criticality: 'normal',
  status: 'running',
  state: 'standby',
  reason: 'none',
  note: null,
  restriction: null,
  since: '2026-01-01T00:00:00.000Z',
  expectedReturnAt: null,
  confirmed: true,
  source: 'staff',
  openTickets: 0,
  activeAlarm: null,
  plannedMaintenance: null,
  modules: [],
  ...extra,
});

const counts = { running: 3, limited: 0, down: 0, maintenance: 0, engineering: 0, offline: 0 };
const board: BoardData = {
  areas: [
    { id: 1, code: 'A', name: 'Bay A', tools: [tool(1, 1), tool(2, 1)] },
    { id: 2, code: 'B', name: 'Bay B', tools: [tool(3, 2)] },
  ],
  counts,
  total: 3,
};

describe('a board change written into the cached board', () => {
  it('when the tool is on the board in its area, then its entry and the counts are replaced and nothing else changes', () => {
    const change: BoardToolChange = {
      tool: tool(2, 1, { status: 'down', state: 'unscheduled_downtime', note: 'Pump' }),
      counts: { ...counts, running: 2, down: 1 },
      total: 3,
    };
    const next = withBoardChange(board, change)!;
    expect(next.areas[0].tools[1]).toEqual(change.tool);
    expect(next.areas[0].tools[0]).toBe(board.areas[0].tools[0]);
    expect(next.areas[1]).toBe(board.areas[1]);
    expect(next.counts).toEqual(change.counts);
    expect(board.areas[0].tools[1].status).toBe('running'); // the cached object is not mutated
  });

  it('when the tool is new or moved to another area, then null (the board is reloaded instead)', () => {
    expect(withBoardChange(board, { tool: tool(9, 1), counts, total: 4 })).toBeNull();
    expect(withBoardChange(board, { tool: tool(2, 2), counts, total: 3 })).toBeNull();
  });
});
