/** Query keys of the notices feature; ['notices'] is what the socket invalidates on notice.created. */
export const noticeKeys = {
  all: ['notices'] as const,
  lists: () => [...noticeKeys.all, 'list'] as const,
  list: (page: { limit: number; offset: number }) => [...noticeKeys.lists(), page] as const,
};
