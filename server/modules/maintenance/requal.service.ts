import { Op, type Transaction } from 'sequelize';
import { RequalRecord, RequalTemplate, type ReturnProof } from './maintenance.model';
import { toolInfo } from './lookups';
import { AppError, badRequest, forbidden, notFound } from '../../lib/errors';
import type { AppDeps, AuthUser } from '../../lib/http';
import { hasRole } from '../../../shared/roles';
import {
  FIGURE_LABELS,
  capability,
  individualsChart,
  judgeLimits,
  parseMeasurementColumn,
  uniformity,
  type UniformityFigure,
} from '../../../shared/requalification';
import type { RequalRecordInput, RequalTemplateInput } from '../../../shared/schemas/maintenance';

// Requalification: per-tool templates (what is measured, unit, spec limits, and which
// uniformity figure each limit applies to) and the records that prove a tool fit to run.

function presentTemplate(t: RequalTemplate) {
  return {
    id: t.id,
    toolId: t.toolId,
    name: t.name,
    quantity: t.quantity,
    unit: t.unit,
    points: t.points,
    target: t.target,
    lsl: t.lsl,
    usl: t.usl,
    // The figure each limit applies to is always named with it.
    limits: t.limits.map((l) => ({ ...l, label: FIGURE_LABELS[l.figure] })),
    active: t.active,
  };
}

function presentRecord(r: RequalRecord) {
  return {
    id: r.id,
    templateId: r.templateId,
    workOrderId: r.workOrderId,
    ticketId: r.ticketId,
    measurements: r.measurements,
    summary: r.summary,
    verdicts: r.verdicts.map((v) => ({ ...v, label: FIGURE_LABELS[v.figure] })),
    passed: r.passed,
    note: r.note,
    recordedById: r.recordedById,
    recordedAt: r.recordedAt.toISOString(),
  };
}
export type RequalRecordView = ReturnType<typeof presentRecord>;

export async function createTemplate(deps: AppDeps, toolId: number, input: RequalTemplateInput) {
  const tool = await toolInfo(deps.sequelize, toolId);
  const t = await RequalTemplate.create({ toolId: tool.id, ...input });
  deps.events.publish({ type: 'maintenance.changed', audience: 'staff', payload: { toolId: tool.id } });
  return presentTemplate(t);
}

export async function updateTemplate(deps: AppDeps, id: number, input: RequalTemplateInput & { active?: boolean }) {
  const t = await RequalTemplate.findByPk(id);
  if (!t) throw notFound('That requalification template');
  await t.update(input);
  deps.events.publish({ type: 'maintenance.changed', audience: 'staff', payload: { toolId: t.toolId } });
  return presentTemplate(t);
}

/** Computes the record: summary, capability against the spec limits, pass/fail per limit. */
export function evaluate(template: RequalTemplate, values: number[]) {
  const summary = uniformity(values);
  const cap = capability({ mean: summary.mean, stdDev: summary.stdDev, lsl: template.lsl, usl: template.usl });
  const verdicts = judgeLimits(summary, template.limits);
  return { summary: { ...summary, ...cap }, verdicts, passed: verdicts.every((v) => v.pass) };
}

export async function createRecord(deps: AppDeps, templateId: number, input: RequalRecordInput, user: AuthUser) {
  const template = await RequalTemplate.findByPk(templateId);
  if (!template || !template.active) throw notFound('That requalification template');
  let values = input.values ?? [];
  if (input.pasted !== undefined) {
    const parsed = parseMeasurementColumn(input.pasted);
    if (parsed.badLines.length > 0)
      throw badRequest('Some pasted lines are not numbers.', {
        pasted: [`Lines ${parsed.badLines.join(', ')} could not be read as numbers.`],
      });
    if (parsed.values.length === 0) throw badRequest('Nothing to record.', { pasted: ['No numbers were found in the pasted text.'] });
    values = parsed.values;
  }
  if (values.length !== template.points) {
    throw badRequest(`This check takes ${template.points} measurements.`, {
      [input.pasted !== undefined ? 'pasted' : 'values']: [`Enter ${template.points} values (got ${values.length}).`],
    });
  }
  const result = evaluate(template, values);
  const record = await RequalRecord.create({
    templateId: template.id,
    toolId: template.toolId,
    workOrderId: input.workOrderId,
    ticketId: input.ticketId,
    measurements: values,
    summary: result.summary,
    verdicts: result.verdicts,
    passed: result.passed,
    note: input.note,
    recordedById: user.id,
    recordedAt: new Date(),
  });
  deps.events.publish({ type: 'maintenance.changed', audience: 'staff', payload: { toolId: template.toolId } });
  return presentRecord(record);
}

const CHART_FIGURES: UniformityFigure[] = ['mean', 'halfRangePct', 'rangePct', 'sigmaPct', 'threeSigmaPct', 'range'];

/** The tool's templates, their last records, and an individuals chart per measured figure. */
export async function toolRequalification(toolId: number) {
  const templates = await RequalTemplate.findAll({ where: { toolId, active: true }, order: [['id', 'ASC']] });
  const out = [];
  for (const t of templates) {
    const records = await RequalRecord.findAll({
      where: { templateId: t.id },
      order: [
        ['recordedAt', 'DESC'],
        ['id', 'DESC'],
      ],
      limit: 50,
    });
    const chronological = [...records].reverse();
    const figures = CHART_FIGURES.filter((f) => f === 'mean' || t.limits.some((l) => l.figure === f));
    const charts = figures
      .map((figure) => {
        const points = chronological
          .filter((r) => r.summary[figure] !== null)
          .map((r) => ({ recordId: r.id, at: r.recordedAt.toISOString(), value: r.summary[figure] as number }));
        if (points.length === 0) return null;
        return { figure, label: FIGURE_LABELS[figure], points, chart: individualsChart(points.map((p) => p.value)) };
      })
      .filter((c) => c !== null);
    out.push({ template: presentTemplate(t), records: records.slice(0, 10).map(presentRecord), charts });
  }
  return out;
}

export async function getTemplate(id: number) {
  const t = await RequalTemplate.findByPk(id);
  if (!t) throw notFound('That requalification template');
  return presentTemplate(t);
}

/**
 * Whether a tool may go back to Running: with no active template, as before; otherwise a
 * passing record of every template since `since` (the downtime's start), or a manager's
 * override with a reason. Throws 409 with what is missing.
 */
export async function returnToServiceProof(
  deps: AppDeps,
  args: { toolId: number; since: Date; user: AuthUser; overrideReason?: string | null },
  transaction?: Transaction,
): Promise<ReturnProof> {
  const templates = await RequalTemplate.findAll({ where: { toolId: args.toolId, active: true }, transaction });
  if (templates.length === 0) return { kind: 'no_template' };
  const recordIds: number[] = [];
  const missing: string[] = [];
  for (const t of templates) {
    const pass = await RequalRecord.findOne({
      where: { templateId: t.id, passed: true, recordedAt: { [Op.gte]: args.since } },
      order: [['recordedAt', 'DESC']],
      transaction,
    });
    if (pass) recordIds.push(pass.id);
    else missing.push(t.name);
  }
  if (missing.length === 0) return { kind: 'record', recordIds };
  if (args.overrideReason) {
    if (!hasRole(args.user.role, 'manager'))
      throw forbidden('Only a manager can return a tool to service without a passing requalification record.');
    return { kind: 'override', reason: args.overrideReason, byId: args.user.id, byName: args.user.name };
  }
  throw new AppError(
    409,
    'requalification_required',
    `The tool cannot return to service yet: it needs a passing requalification record (${missing.join(', ')}) recorded since ${args.since.toISOString()}, or a manager's override with a reason.`,
  );
}
