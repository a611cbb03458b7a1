import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { TICKET_STATUSES, type TicketStatus } from '../../../shared/ticket-workflow';
import { PRIORITIES, type Priority } from '../../../shared/priority';
import { IMPACTS, WAIT_REASONS, FIX_KINDS, type Impact, type Hazard, type WaitReason, type FixKind } from '../../../shared/report-options';

export class Ticket extends Model<InferAttributes<Ticket>, InferCreationAttributes<Ticket>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare moduleId: number | null;
  declare category: string;
  declare title: string;
  declare description: string | null;
  declare alarmText: string | null;
  declare impact: Impact;
  declare hazards: Hazard[];
  declare wafersCount: CreationOptional<number>;
  declare wafersOwner: string | null;
  declare wafersRecoverable: 'yes' | 'no' | 'unknown' | null;
  declare status: CreationOptional<TicketStatus>;
  declare waitReason: WaitReason | null;
  declare priority: Priority;
  declare priorityOverridden: CreationOptional<boolean>;
  declare reporterId: number | null;
  declare assigneeId: number | null;
  declare mergedIntoId: number | null;
  declare fixKind: FixKind | null;
  declare failureMode: string | null;
  declare cause: string | null;
  declare workDone: string | null;
  declare partsUsed: string | null;
  declare handsOnMinutes: number | null;
  declare wafersRecovered: number | null;
  declare wafersReturned: number | null;
  declare acknowledgedAt: Date | null;
  declare fixedAt: Date | null;
  declare closedAt: Date | null;
  declare resolvedAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/**
 * The fields a ticket fills in only as people work on it (waiting, merging, the repair record
 * and its milestones): every new ticket starts with all of them empty.
 */
export const UNWORKED_TICKET_FIELDS = {
  waitReason: null,
  mergedIntoId: null,
  fixKind: null,
  failureMode: null,
  cause: null,
  workDone: null,
  partsUsed: null,
  handsOnMinutes: null,
  wafersRecovered: null,
  wafersReturned: null,
  acknowledgedAt: null,
  fixedAt: null,
  closedAt: null,
  resolvedAt: null,
} as const satisfies Partial<InferCreationAttributes<Ticket>>;

/** Append-only timeline entry: who did what, when, and before -> after in `data`. */
export class TicketEvent extends Model<InferAttributes<TicketEvent>, InferCreationAttributes<TicketEvent>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare actorId: number | null;
  declare kind: string;
  declare internal: CreationOptional<boolean>;
  declare body: string | null;
  declare data: Record<string, unknown> | null;
  declare createdAt: CreationOptional<Date>;
}

export class Photo extends Model<InferAttributes<Photo>, InferCreationAttributes<Photo>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare eventId: number | null;
  declare uploaderId: number | null;
  declare storedName: string;
  declare thumbName: string;
  declare mime: string;
  declare width: number;
  declare height: number;
  declare bytes: number;
  declare createdAt: CreationOptional<Date>;
}

export class ServiceTarget extends Model<InferAttributes<ServiceTarget>, InferCreationAttributes<ServiceTarget>> {
  declare priority: Priority;
  declare acknowledgeMinutes: number;
  declare restoreMinutes: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

// MariaDB's JSON is LONGTEXT underneath: parse on read, stringify on write.
const json = (field: string) => ({
  type: DataTypes.TEXT('long'),
  get(this: Model) {
    const raw = this.getDataValue(field) as unknown;
    return typeof raw === 'string' ? JSON.parse(raw) : (raw ?? null);
  },
  set(this: Model, value: unknown) {
    this.setDataValue(field, value == null ? null : JSON.stringify(value));
  },
});

export function initTicketModels(sequelize: Sequelize) {
  Ticket.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      moduleId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      category: { type: DataTypes.STRING(40), allowNull: false },
      title: { type: DataTypes.STRING(160), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: true },
      alarmText: { type: DataTypes.STRING(1000), allowNull: true },
      impact: { type: DataTypes.ENUM(...IMPACTS), allowNull: false },
      hazards: { ...json('hazards'), allowNull: false },
      wafersCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      wafersOwner: { type: DataTypes.STRING(120), allowNull: true },
      wafersRecoverable: { type: DataTypes.ENUM('yes', 'no', 'unknown'), allowNull: true },
      status: { type: DataTypes.ENUM(...TICKET_STATUSES), allowNull: false, defaultValue: 'reported' },
      waitReason: { type: DataTypes.ENUM(...WAIT_REASONS), allowNull: true },
      priority: { type: DataTypes.ENUM(...PRIORITIES), allowNull: false },
      priorityOverridden: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      reporterId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      assigneeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      mergedIntoId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      fixKind: { type: DataTypes.ENUM(...FIX_KINDS), allowNull: true },
      failureMode: { type: DataTypes.STRING(120), allowNull: true },
      cause: { type: DataTypes.TEXT, allowNull: true },
      workDone: { type: DataTypes.TEXT, allowNull: true },
      partsUsed: { type: DataTypes.TEXT, allowNull: true },
      handsOnMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      wafersRecovered: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      wafersReturned: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      acknowledgedAt: { type: DataTypes.DATE(3), allowNull: true },
      fixedAt: { type: DataTypes.DATE(3), allowNull: true },
      closedAt: { type: DataTypes.DATE(3), allowNull: true },
      resolvedAt: { type: DataTypes.DATE(3), allowNull: true },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    // version: true — Sequelize refuses a save whose version is stale (optimistic locking).
    { sequelize, tableName: 'tickets', modelName: 'Ticket', version: true },
  );
  TicketEvent.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      internal: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      body: { type: DataTypes.TEXT, allowNull: true },
      data: { ...json('data'), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'ticket_events', modelName: 'TicketEvent', updatedAt: false },
  );
  Photo.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      eventId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
      uploaderId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      storedName: { type: DataTypes.STRING(80), allowNull: false },
      thumbName: { type: DataTypes.STRING(80), allowNull: false },
      mime: { type: DataTypes.STRING(40), allowNull: false },
      width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      bytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'photos', modelName: 'Photo', updatedAt: false },
  );
  ServiceTarget.init(
    {
      priority: { type: DataTypes.ENUM(...PRIORITIES), primaryKey: true },
      acknowledgeMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      restoreMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'service_targets', modelName: 'ServiceTarget' },
  );

  Ticket.hasMany(TicketEvent, { as: 'events', foreignKey: 'ticketId' });
  Ticket.hasMany(Photo, { as: 'photos', foreignKey: 'ticketId' });
}
