/** Query keys of the tools feature, from general to specific. */
export const toolKeys = {
  all: ['tools'] as const,
  details: () => [...toolKeys.all, 'detail'] as const,
  detail: (code: string) => [...toolKeys.details(), code] as const,
  histories: () => [...toolKeys.all, 'history'] as const,
  historiesOf: (toolId: number) => [...toolKeys.histories(), toolId] as const,
  history: (toolId: number, page: { limit: number; offset: number }) => [...toolKeys.historiesOf(toolId), page] as const,
  following: () => [...toolKeys.all, 'following'] as const,
  labels: (areaId: number | null) => [...toolKeys.all, 'labels', areaId] as const,
};
