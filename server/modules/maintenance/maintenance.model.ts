import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ChecklistStep, WorkOrderStatus } from '../../../shared/schemas/maintenance';
import type { FigureLimit, LimitVerdict, Uniformity } from '../../../shared/requalification';

export interface StepResult {
  step: number;
  done: boolean;
  value: number | null;
  /** Set by the server from the step's limits, so the mark cannot disagree with the plan. */
  outOfLimit: boolean;
  by: number | null;
  at: string;
}

export type ReturnProof =
  { kind: 'record'; recordIds: number[] } | { kind: 'override'; reason: string; byId: number; byName: string } | { kind: 'no_template' };

export class MaintenancePlan extends Model<InferAttributes<MaintenancePlan>, InferCreationAttributes<MaintenancePlan>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare moduleId: number | null;
  declare title: string;
  declare checklist: ChecklistStep[];
  declare estimatedMinutes: number;
  declare everyDays: number | null;
  declare everyUnits: number | null;
  declare counterName: string | null;
  declare leadDays: number;
  declare leadUnits: number;
  declare graceFactor: number;
  declare basisAt: Date;
  declare basisCounter: number | null;
  declare lastDoneAt: Date | null;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PlanChange extends Model<InferAttributes<PlanChange>, InferCreationAttributes<PlanChange>> {
  declare id: CreationOptional<number>;
  declare planId: number;
  declare actorId: number | null;
  declare changes: Record<string, { from: unknown; to: unknown }>;
  declare createdAt: CreationOptional<Date>;
}

export class WorkOrder extends Model<InferAttributes<WorkOrder>, InferCreationAttributes<WorkOrder>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare moduleId: number | null;
  declare planId: number | null;
  declare ticketId: number | null;
  declare kind: 'preventive' | 'corrective';
  declare title: string;
  declare status: CreationOptional<WorkOrderStatus>;
  declare dueKey: string | null;
  declare dueAt: Date | null;
  declare dueCounter: number | null;
  declare graceUntil: Date | null;
  declare graceUntilCounter: number | null;
  declare checklist: ChecklistStep[];
  declare results: StepResult[];
  declare estimatedMinutes: number | null;
  declare handsOnMinutes: CreationOptional<number | null>;
  declare notes: CreationOptional<string | null>;
  declare skipReason: CreationOptional<string | null>;
  declare returnProof: CreationOptional<ReturnProof | null>;
  declare startedAt: CreationOptional<Date | null>;
  declare startedById: CreationOptional<number | null>;
  declare doneAt: CreationOptional<Date | null>;
  declare doneById: CreationOptional<number | null>;
  declare doneCounter: CreationOptional<number | null>;
  declare withinGrace: CreationOptional<boolean | null>;
  declare createdById: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class MaintenanceWindow extends Model<InferAttributes<MaintenanceWindow>, InferCreationAttributes<MaintenanceWindow>> {
  declare id: CreationOptional<number>;
  declare workOrderId: number;
  declare toolId: number;
  declare uid: string;
  declare startsAt: Date;
  declare endsAt: Date;
  declare status: CreationOptional<'booked' | 'cancelled'>;
  declare sequence: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class CalendarFeed extends Model<InferAttributes<CalendarFeed>, InferCreationAttributes<CalendarFeed>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare scope: 'facility' | 'area' | 'tool';
  declare scopeId: number | null;
  declare label: string;
  declare tokenHash: string;
  declare revokedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

export class RequalTemplate extends Model<InferAttributes<RequalTemplate>, InferCreationAttributes<RequalTemplate>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare name: string;
  declare quantity: string;
  declare unit: string;
  declare points: number;
  declare target: number | null;
  declare lsl: number | null;
  declare usl: number | null;
  declare limits: FigureLimit[];
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class RequalRecord extends Model<InferAttributes<RequalRecord>, InferCreationAttributes<RequalRecord>> {
  declare id: CreationOptional<number>;
  declare templateId: number;
  declare toolId: number;
  declare workOrderId: number | null;
  declare ticketId: number | null;
  declare measurements: number[];
  declare summary: Uniformity & { cp: number | null; cpk: number | null; cpu: number | null; cpl: number | null };
  declare verdicts: LimitVerdict[];
  declare passed: boolean;
  declare note: string | null;
  declare recordedById: number | null;
  declare recordedAt: Date;
}

export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare partNumber: string;
  declare stock: number;
  declare reorderLevel: number;
  declare lowNoticeAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PartUse extends Model<InferAttributes<PartUse>, InferCreationAttributes<PartUse>> {
  declare id: CreationOptional<number>;
  declare partId: number | null;
  declare freeText: string | null;
  declare quantity: number;
  declare workOrderId: number | null;
  declare ticketId: number | null;
  declare usedById: number | null;
  declare usedAt: Date;
}

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const stamps = { createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) };
const fk = (allowNull: boolean) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull });
const date = (allowNull: boolean) => ({ type: DataTypes.DATE(3), allowNull });
// Fresh objects per attribute: Sequelize writes the column name into the definition it is given.
const dbl = () => ({ type: DataTypes.DOUBLE, allowNull: true });

/** DECIMAL columns come back as strings from the connector; the plans want numbers. */
const decimalAsNumber = {
  type: DataTypes.DECIMAL(4, 2),
  allowNull: false,
  defaultValue: 1.25,
  get(this: Model) {
    return Number(this.getDataValue('graceFactor'));
  },
};

export function initMaintenanceModels(sequelize: Sequelize) {
  MaintenancePlan.init(
    {
      id,
      toolId: fk(false),
      moduleId: fk(true),
      title: { type: DataTypes.STRING(160), allowNull: false },
      checklist: { type: DataTypes.JSON, allowNull: false },
      estimatedMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      everyDays: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      everyUnits: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      counterName: { type: DataTypes.STRING(40), allowNull: true },
      leadDays: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      leadUnits: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      graceFactor: decimalAsNumber,
      basisAt: date(false),
      basisCounter: dbl(),
      lastDoneAt: date(true),
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      createdById: fk(true),
      ...stamps,
    },
    { sequelize, tableName: 'maintenance_plans', modelName: 'MaintenancePlan', version: true },
  );
  PlanChange.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      planId: fk(false),
      actorId: fk(true),
      changes: { type: DataTypes.JSON, allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'maintenance_plan_changes', modelName: 'PlanChange', updatedAt: false },
  );
  WorkOrder.init(
    {
      id,
      toolId: fk(false),
      moduleId: fk(true),
      planId: fk(true),
      ticketId: fk(true),
      kind: { type: DataTypes.ENUM('preventive', 'corrective'), allowNull: false },
      title: { type: DataTypes.STRING(160), allowNull: false },
      status: { type: DataTypes.ENUM('planned', 'scheduled', 'in_progress', 'done', 'skipped'), allowNull: false, defaultValue: 'planned' },
      dueKey: { type: DataTypes.STRING(80), allowNull: true },
      dueAt: date(true),
      dueCounter: dbl(),
      graceUntil: date(true),
      graceUntilCounter: dbl(),
      checklist: { type: DataTypes.JSON, allowNull: false },
      results: { type: DataTypes.JSON, allowNull: false },
      estimatedMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      handsOnMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, defaultValue: null },
      notes: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
      skipReason: { type: DataTypes.STRING(1000), allowNull: true, defaultValue: null },
      returnProof: { type: DataTypes.JSON, allowNull: true, defaultValue: null },
      startedAt: { ...date(true), defaultValue: null },
      startedById: { ...fk(true), defaultValue: null },
      doneAt: { ...date(true), defaultValue: null },
      doneById: { ...fk(true), defaultValue: null },
      doneCounter: { ...dbl(), defaultValue: null },
      withinGrace: { type: DataTypes.BOOLEAN, allowNull: true, defaultValue: null },
      createdById: fk(true),
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      ...stamps,
    },
    { sequelize, tableName: 'work_orders', modelName: 'WorkOrder', version: true },
  );
  MaintenanceWindow.init(
    {
      id,
      workOrderId: fk(false),
      toolId: fk(false),
      uid: { type: DataTypes.STRING(80), allowNull: false },
      startsAt: date(false),
      endsAt: date(false),
      status: { type: DataTypes.ENUM('booked', 'cancelled'), allowNull: false, defaultValue: 'booked' },
      sequence: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      ...stamps,
    },
    { sequelize, tableName: 'maintenance_windows', modelName: 'MaintenanceWindow' },
  );
  CalendarFeed.init(
    {
      id,
      userId: fk(false),
      scope: { type: DataTypes.ENUM('facility', 'area', 'tool'), allowNull: false },
      scopeId: fk(true),
      label: { type: DataTypes.STRING(120), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      revokedAt: date(true),
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'calendar_feeds', modelName: 'CalendarFeed', updatedAt: false },
  );
  RequalTemplate.init(
    {
      id,
      toolId: fk(false),
      name: { type: DataTypes.STRING(160), allowNull: false },
      quantity: { type: DataTypes.STRING(120), allowNull: false },
      unit: { type: DataTypes.STRING(20), allowNull: false },
      points: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      target: dbl(),
      lsl: dbl(),
      usl: dbl(),
      limits: { type: DataTypes.JSON, allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      ...stamps,
    },
    { sequelize, tableName: 'requal_templates', modelName: 'RequalTemplate' },
  );
  RequalRecord.init(
    {
      id,
      templateId: fk(false),
      toolId: fk(false),
      workOrderId: fk(true),
      ticketId: fk(true),
      measurements: { type: DataTypes.JSON, allowNull: false },
      summary: { type: DataTypes.JSON, allowNull: false },
      verdicts: { type: DataTypes.JSON, allowNull: false },
      passed: { type: DataTypes.BOOLEAN, allowNull: false },
      note: { type: DataTypes.STRING(1000), allowNull: true },
      recordedById: fk(true),
      recordedAt: date(false),
    },
    { sequelize, tableName: 'requal_records', modelName: 'RequalRecord', timestamps: false },
  );
  Part.init(
    {
      id,
      name: { type: DataTypes.STRING(160), allowNull: false },
      partNumber: { type: DataTypes.STRING(80), allowNull: false },
      stock: { type: DataTypes.INTEGER, allowNull: false },
      reorderLevel: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      lowNoticeAt: { ...date(true), defaultValue: null },
      ...stamps,
    },
    { sequelize, tableName: 'parts', modelName: 'Part' },
  );
  PartUse.init(
    {
      id,
      partId: fk(true),
      freeText: { type: DataTypes.STRING(200), allowNull: true },
      quantity: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      workOrderId: fk(true),
      ticketId: fk(true),
      usedById: fk(true),
      usedAt: date(false),
    },
    { sequelize, tableName: 'part_uses', modelName: 'PartUse', timestamps: false },
  );
}
