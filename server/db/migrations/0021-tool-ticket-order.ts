import type { QueryInterface } from 'sequelize';

/**
 * The tool-based filters (a tool's tickets, an area, my tools) read a few tools' tickets and
 * sort them: with the sort key in the tool's index, that sort needs no ticket rows.
 */
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE tickets
    ADD KEY tickets_tool_by_queue (tool_id, priority, created_at, id, status, has_hazard, assignee_id),
    ADD KEY tickets_tool_by_newest (tool_id, created_at, id, status, has_hazard, assignee_id)`);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`ALTER TABLE tickets DROP KEY tickets_tool_by_queue, DROP KEY tickets_tool_by_newest`);
}
