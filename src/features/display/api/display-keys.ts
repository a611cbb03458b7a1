/** Query keys of the lobby display; the key is part of each, so two links never share data. */
export const displayKeys = {
  all: ['display'] as const,
  link: (key: string) => [...displayKeys.all, 'link', key] as const,
  boards: () => [...displayKeys.all, 'board'] as const,
  board: (key: string) => [...displayKeys.boards(), key] as const,
};
