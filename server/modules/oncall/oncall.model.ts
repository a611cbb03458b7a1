import { DataTypes, Model, type Sequelize } from 'sequelize';
import type { Duty, Severity } from '../../../shared/oncall';
import { DUTIES, SEVERITIES } from '../../../shared/oncall';

export class OncallContact extends Model {
  declare userId: number;
  declare phone: string;
}

export class OncallShift extends Model {
  declare id: number;
  declare userId: number;
  declare duty: Duty;
  declare startsAt: Date;
  declare endsAt: Date;
  declare weekly: boolean;
  declare repeatUntil: Date | null;
}

export class OncallCover extends Model {
  declare id: number;
  declare userId: number;
  declare duty: Duty;
  declare startsAt: Date;
  declare endsAt: Date;
  declare note: string;
}

export class OncallPolicy extends Model {
  declare severity: Severity;
  declare stepMinutes: number;
  declare managerId: number | null;
  declare nightStarts: string | null;
  declare nightEnds: string | null;
}

export type EscalationStatus = 'open' | 'acknowledged' | 'unanswered';

export class OncallEscalation extends Model {
  declare id: number;
  declare ticketId: number;
  declare toolId: number;
  declare openTicketId: number | null;
  declare severity: Severity;
  declare status: EscalationStatus;
  declare step: number;
  declare stepMinutes: number;
  declare nextStepAt: Date | null;
  declare headline: string;
  declare details: string;
  declare acknowledgedAt: Date | null;
  declare acknowledgedBy: number | null;
  declare acknowledgedVia: 'link' | 'sms' | 'app' | null;
  declare createdAt: Date;
}

export class OncallPage extends Model {
  declare id: number;
  declare escalationId: number;
  declare step: number;
  declare userId: number;
  declare phone: string | null;
  declare replyCode: string;
  declare tokenHash: string;
  declare linkUsedAt: Date | null;
  declare createdAt: Date;
  declare escalation?: OncallEscalation;
}

export class SmsOutbox extends Model {
  declare id: number;
  declare toNumber: string;
  declare body: string;
  declare idempotencyKey: string;
  declare status: 'pending' | 'sent';
  declare attempts: number;
  declare nextAttemptAt: Date;
  declare lastError: string | null;
  declare providerId: string | null;
  declare sentAt: Date | null;
  declare createdAt: Date;
}

export class SmsInbound extends Model {
  declare id: number;
  declare eventId: string;
  declare fromNumber: string;
  declare body: string;
  declare pageId: number | null;
}

const duty = { type: DataTypes.ENUM(...DUTIES), allowNull: false };
const at = (allowNull = false) => ({ type: DataTypes.DATE(3), allowNull });
const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const ref = (allowNull = false) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull });

export function initOncallModels(sequelize: Sequelize) {
  const base = { sequelize, underscored: true };
  OncallContact.init(
    { userId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true }, phone: { type: DataTypes.STRING(20), allowNull: false } },
    { ...base, tableName: 'oncall_contacts' },
  );
  OncallShift.init(
    {
      id,
      userId: ref(),
      duty,
      startsAt: at(),
      endsAt: at(),
      weekly: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      repeatUntil: at(true),
    },
    { ...base, tableName: 'oncall_shifts' },
  );
  OncallCover.init(
    { id, userId: ref(), duty, startsAt: at(), endsAt: at(), note: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' } },
    { ...base, tableName: 'oncall_covers' },
  );
  OncallPolicy.init(
    {
      severity: { type: DataTypes.ENUM(...SEVERITIES), primaryKey: true },
      stepMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      managerId: ref(true),
      nightStarts: { type: DataTypes.CHAR(5), allowNull: true },
      nightEnds: { type: DataTypes.CHAR(5), allowNull: true },
    },
    { ...base, tableName: 'oncall_policies', createdAt: false },
  );
  OncallEscalation.init(
    {
      id,
      ticketId: ref(),
      toolId: ref(),
      openTicketId: ref(true),
      severity: { type: DataTypes.ENUM(...SEVERITIES), allowNull: false },
      status: { type: DataTypes.ENUM('open', 'acknowledged', 'unanswered'), allowNull: false, defaultValue: 'open' },
      step: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 0 },
      stepMinutes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      nextStepAt: at(true),
      headline: { type: DataTypes.STRING(300), allowNull: false },
      details: { type: DataTypes.TEXT, allowNull: false },
      acknowledgedAt: at(true),
      acknowledgedBy: ref(true),
      acknowledgedVia: { type: DataTypes.ENUM('link', 'sms', 'app'), allowNull: true },
    },
    { ...base, tableName: 'oncall_escalations' },
  );
  OncallPage.init(
    {
      id,
      escalationId: ref(),
      step: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
      userId: ref(),
      phone: { type: DataTypes.STRING(20), allowNull: true },
      replyCode: { type: DataTypes.CHAR(4), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      linkUsedAt: at(true),
    },
    { ...base, tableName: 'oncall_pages', updatedAt: false },
  );
  SmsOutbox.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      toNumber: { type: DataTypes.STRING(20), allowNull: false },
      body: { type: DataTypes.STRING(1000), allowNull: false },
      idempotencyKey: { type: DataTypes.STRING(80), allowNull: false },
      status: { type: DataTypes.ENUM('pending', 'sent'), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      nextAttemptAt: at(),
      lastError: { type: DataTypes.STRING(1000), allowNull: true },
      providerId: { type: DataTypes.STRING(100), allowNull: true },
      sentAt: at(true),
    },
    { ...base, tableName: 'sms_outbox' },
  );
  SmsInbound.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      eventId: { type: DataTypes.STRING(100), allowNull: false },
      fromNumber: { type: DataTypes.STRING(20), allowNull: false },
      body: { type: DataTypes.STRING(1000), allowNull: false },
      pageId: ref(true),
    },
    { ...base, tableName: 'sms_inbound', updatedAt: false },
  );
  OncallPage.belongsTo(OncallEscalation, { as: 'escalation', foreignKey: 'escalationId' });
}
