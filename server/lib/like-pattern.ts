/**
 * A LIKE pattern that finds `text` anywhere in a column. %, _ and \ in what the user typed are
 * matched literally (MariaDB's default LIKE escape is the backslash), so a search for "50%"
 * does not match every row with a 50 in it.
 */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
