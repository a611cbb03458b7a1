// One rule for finding a tool by what people type: case, spaces, hyphens, underscores and dots
// do not matter, so "lpcvd3", "LPCVD 3" and "lpcvd-3" all find LPCVD-3. Used by the board
// (server and client) and, as the same rule in SQL, by the report form's tool search.

/** The text with case and separators removed. */
export function searchKey(text: string): string {
  return text.toLowerCase().replace(/[\s._-]+/g, '');
}

/** Whether the typed text is found in any of the fields (code, name, bay name…). */
export function matchesSearch(typed: string | null | undefined, fields: readonly (string | null | undefined)[]): boolean {
  const needle = searchKey(typed ?? '');
  if (!needle) return true;
  return fields.some((f) => f != null && searchKey(f).includes(needle));
}

/** The SQL form of searchKey for a column (MariaDB; the collation already ignores case). */
export function sqlSearchKey(column: string): string {
  return `REPLACE(REPLACE(REPLACE(REPLACE(${column}, ' ', ''), '-', ''), '_', ''), '.', '')`;
}
