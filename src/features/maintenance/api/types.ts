import type { NextDue } from '@shared/maintenance-plan';
import type { ChecklistStep, WorkOrderStatus } from '@shared/schemas/maintenance';
import type { FigureLimit, IndividualsChart, LimitVerdict, Uniformity, UniformityFigure } from '@shared/requalification';

// What the maintenance API answers (the server's presenters), as the client reads it.

export interface StepResult {
  step: number;
  done: boolean;
  value: number | null;
  outOfLimit: boolean;
  by: number | null;
  at: string;
}

export type ReturnProof =
  { kind: 'record'; recordIds: number[] } | { kind: 'override'; reason: string; byId: number; byName: string } | { kind: 'no_template' };

export interface WorkOrder {
  id: number;
  toolId: number;
  moduleId: number | null;
  planId: number | null;
  ticketId: number | null;
  kind: 'preventive' | 'corrective';
  title: string;
  status: WorkOrderStatus;
  dueAt: string | null;
  dueCounter: number | null;
  graceUntil: string | null;
  graceUntilCounter: number | null;
  checklist: ChecklistStep[];
  results: StepResult[];
  estimatedMinutes: number | null;
  handsOnMinutes: number | null;
  notes: string | null;
  skipReason: string | null;
  returnProof: ReturnProof | null;
  startedAt: string | null;
  doneAt: string | null;
  withinGrace: boolean | null;
  version: number;
  createdAt: string;
}

export interface PlanView {
  id: number;
  toolId: number;
  title: string;
  checklist: ChecklistStep[];
  estimatedMinutes: number;
  everyDays: number | null;
  everyUnits: number | null;
  counterName: string | null;
  graceFactor: number;
  lastDoneAt: string | null;
  counterNow: number | null;
  due: NextDue;
  overdue: boolean;
  version: number;
}

export interface WorkOrderDetail {
  workOrder: WorkOrder;
  tool: { id: number; code: string; name: string };
  plan: PlanView | null;
  window: { uid: string; startsAt: string; endsAt: string; status: 'booked' | 'cancelled' } | null;
  parts: {
    id: number;
    partId: number | null;
    name: string | null;
    partNumber: string | null;
    freeText: string | null;
    quantity: number;
    usedAt: string;
  }[];
  requalRecords: { id: number; templateId: number; passed: boolean; recordedAt: string }[];
  people: Record<string, string>;
}

export interface OverviewOrder {
  id: number;
  toolId: number;
  toolCode: string;
  toolName: string;
  title: string;
  status: WorkOrderStatus;
  kind: string;
  dueAt: string | null;
  dueCounter: number | null;
  startsAt: string | null;
  endsAt: string | null;
  late: boolean;
}

export interface Overview {
  generatedAt: string;
  open: OverviewOrder[];
  overdue: {
    planId: number;
    title: string;
    toolCode: string;
    toolName: string;
    dueAt: string | null;
    dueAtCounter: number | null;
    counterNow: number | null;
    pastGrace: boolean;
  }[];
  planCount: number;
}

export interface PartView {
  id: number;
  name: string;
  partNumber: string;
  stock: number;
  reorderLevel: number;
  low: boolean;
  toolIds: number[];
}

export interface RequalTemplateView {
  id: number;
  name: string;
  quantity: string;
  unit: string;
  points: number;
  target: number | null;
  lsl: number | null;
  usl: number | null;
  limits: (FigureLimit & { label: string })[];
}

export interface RequalRecordView {
  id: number;
  templateId: number;
  measurements: number[];
  summary: Uniformity & { cp: number | null; cpk: number | null };
  verdicts: (LimitVerdict & { label: string })[];
  passed: boolean;
  recordedAt: string;
}

export interface ToolRequal {
  template: RequalTemplateView;
  records: RequalRecordView[];
  charts: { figure: UniformityFigure; label: string; points: { recordId: number; at: string; value: number }[]; chart: IndividualsChart }[];
}

export interface FeedView {
  id: number;
  scope: 'facility' | 'area' | 'tool';
  scopeId: number | null;
  label: string;
  createdAt: string;
  url: string | null;
}
