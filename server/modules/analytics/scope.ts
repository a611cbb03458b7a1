import type { AnalyticsQuery } from '../../../shared/schemas/analytics';

/** Which tools a figure covers. */
export type Scope = { kind: 'facility' } | { kind: 'area'; areaId: number } | { kind: 'tool'; toolId: number };

export function scopeOf(query: Pick<AnalyticsQuery, 'scope' | 'areaId' | 'toolId'>): Scope {
  if (query.scope === 'area') return { kind: 'area', areaId: query.areaId! };
  if (query.scope === 'tool') return { kind: 'tool', toolId: query.toolId! };
  return { kind: 'facility' };
}

/** SQL that limits rows of `alias` (a table with tool_id, or tools itself) to the scope. */
export function scopeSql(scope: Scope, alias: string, toolsTable = false): string {
  const column = toolsTable ? `${alias}.id` : `${alias}.tool_id`;
  if (scope.kind === 'tool') return ` AND ${column} = :scopeToolId`;
  if (scope.kind === 'area') {
    return toolsTable ? ` AND ${alias}.area_id = :scopeAreaId` : ` AND ${column} IN (SELECT id FROM tools WHERE area_id = :scopeAreaId)`;
  }
  return '';
}

/** The named replacements scopeSql refers to. */
export function scopeReplacements(scope: Scope): Record<string, unknown> {
  if (scope.kind === 'tool') return { scopeToolId: scope.toolId };
  if (scope.kind === 'area') return { scopeAreaId: scope.areaId };
  return {};
}
