import type { QueryInterface } from 'sequelize';

/**
 * Indexes that keep every paged list as cheap on its last page as on its first, over years of
 * history (docs/performance.md):
 * - tickets: a stored hazard flag (`JSON_LENGTH(hazards) > 0` cannot use an index), and one
 *   covering index per sort order the lists offer. Each starts with the full sort key (id
 *   included, so ties in priority and creation time keep their order) and carries the filter
 *   columns, so a page's ids are found by walking the index alone.
 * - ticket_events: My reports finds the tickets a member added a report to without reading
 *   the events.
 * - state_intervals: a tool's open states by (tool, open_flag) and its history newest first
 *   across its modules.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`ALTER TABLE tickets
    ADD COLUMN has_hazard TINYINT AS (IF(JSON_LENGTH(hazards) > 0, 1, 0)) PERSISTENT,
    ADD KEY tickets_by_queue (priority, created_at, id, status, tool_id, has_hazard, assignee_id),
    ADD KEY tickets_by_newest (created_at, id, status, tool_id, has_hazard, assignee_id),
    ADD KEY tickets_hazard (has_hazard, priority, created_at, id)`);
  await q(`ALTER TABLE ticket_events ADD KEY ticket_events_actor_kind (actor_id, kind, ticket_id)`);
  await q(`ALTER TABLE state_intervals
    ADD KEY state_open_by_tool (tool_id, open_flag),
    ADD KEY state_tool_history (tool_id, started_at, id)`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`ALTER TABLE state_intervals DROP KEY state_open_by_tool, DROP KEY state_tool_history`);
  // InnoDB dropped the foreign key's own index on actor_id when the wider one arrived: put it back first.
  await q(`ALTER TABLE ticket_events ADD KEY ticket_events_actor_id (actor_id), DROP KEY ticket_events_actor_kind`);
  await q(`ALTER TABLE tickets DROP KEY tickets_by_queue, DROP KEY tickets_by_newest, DROP KEY tickets_hazard, DROP COLUMN has_hazard`);
}
