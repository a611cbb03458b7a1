/** Query keys of the alarms feature, from general to specific. */
export const alarmKeys = {
  all: ['alarms'] as const,
  tools: () => [...alarmKeys.all, 'tool'] as const,
  tool: (code: string) => [...alarmKeys.tools(), code] as const,
  tickets: () => [...alarmKeys.all, 'ticket'] as const,
  ticket: (id: number) => [...alarmKeys.tickets(), id] as const,
  loads: () => [...alarmKeys.all, 'load'] as const,
  load: (params: { from?: string; to?: string }) => [...alarmKeys.loads(), params] as const,
  toolKeys: (code: string) => [...alarmKeys.all, 'keys', code] as const,
};
