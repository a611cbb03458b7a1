import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { ALARM_RULES, type AlarmRule } from '../../../shared/schemas/alarms';

/** A per-tool API key; only its SHA-256 is kept. */
export class ToolKey extends Model<InferAttributes<ToolKey>, InferCreationAttributes<ToolKey>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare label: string;
  declare keyHash: string;
  declare keyHint: string;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare lastUsedAt: Date | null;
  declare revokedAt: Date | null;
}

/** What one alarm ID means on one tool, and what happens when it sets. */
export class AlarmDefinition extends Model<InferAttributes<AlarmDefinition>, InferCreationAttributes<AlarmDefinition>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare alarmKey: string;
  declare text: string;
  declare category: number | null;
  /** null: the tool's default, else the facility's rule for the category. */
  declare rule: AlarmRule | null;
  declare moduleId: number | null;
  /** Set while the alarm chatters; its notifications are held until it stays clear. */
  declare chatteringSince: Date | null;
  declare heldCount: CreationOptional<number>;
  declare lastNotifiedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** One set → clear interval of an alarm (cleared_at null while it is set). */
export class AlarmOccurrence extends Model<InferAttributes<AlarmOccurrence>, InferCreationAttributes<AlarmOccurrence>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare definitionId: number;
  declare moduleId: number | null;
  declare setAt: Date;
  declare clearedAt: Date | null;
  declare clearedBy: 'tool' | 'person' | null;
  declare ticketId: number | null;
  declare chattering: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
}

export class AlarmToolSettings extends Model<InferAttributes<AlarmToolSettings>, InferCreationAttributes<AlarmToolSettings>> {
  declare toolId: number;
  declare defaultRule: AlarmRule | null;
  declare chatterCount: CreationOptional<number>;
  declare chatterWindowS: CreationOptional<number>;
  declare floodStartedAt: Date | null;
  declare updatedAt: CreationOptional<Date>;
}

export class AlarmCategoryRule extends Model<InferAttributes<AlarmCategoryRule>, InferCreationAttributes<AlarmCategoryRule>> {
  declare category: number;
  declare rule: AlarmRule;
  declare updatedAt: CreationOptional<Date>;
}

/** A cumulative usage counter reading (wafers, run hours, …) as the tool sent it. */
export class CounterReading extends Model<InferAttributes<CounterReading>, InferCreationAttributes<CounterReading>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare senderId: string;
  declare counter: string;
  declare value: number;
  declare at: Date;
  declare isReset: CreationOptional<boolean>;
  declare receivedAt: Date;
}

export function initAlarmModels(sequelize: Sequelize) {
  const rule = DataTypes.ENUM(...ALARM_RULES);
  ToolKey.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      label: { type: DataTypes.STRING(80), allowNull: false },
      keyHash: { type: DataTypes.CHAR(64), allowNull: false },
      keyHint: { type: DataTypes.STRING(12), allowNull: false },
      createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE(3),
      lastUsedAt: { type: DataTypes.DATE(3), allowNull: true },
      revokedAt: { type: DataTypes.DATE(3), allowNull: true },
    },
    { sequelize, tableName: 'tool_keys', modelName: 'ToolKey', updatedAt: false },
  );
  AlarmDefinition.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      alarmKey: { type: DataTypes.STRING(64), allowNull: false },
      text: { type: DataTypes.STRING(500), allowNull: false },
      category: { type: DataTypes.TINYINT.UNSIGNED, allowNull: true },
      rule: { type: rule, allowNull: true },
      moduleId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      chatteringSince: { type: DataTypes.DATE(3), allowNull: true },
      heldCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      lastNotifiedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'alarm_definitions', modelName: 'AlarmDefinition' },
  );
  AlarmOccurrence.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      definitionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      moduleId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      setAt: { type: DataTypes.DATE(3), allowNull: false },
      clearedAt: { type: DataTypes.DATE(3), allowNull: true },
      clearedBy: { type: DataTypes.ENUM('tool', 'person'), allowNull: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      chattering: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'alarm_occurrences', modelName: 'AlarmOccurrence', updatedAt: false },
  );
  AlarmToolSettings.init(
    {
      toolId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      defaultRule: { type: rule, allowNull: true },
      chatterCount: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false, defaultValue: 3 },
      chatterWindowS: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 60 },
      floodStartedAt: { type: DataTypes.DATE(3), allowNull: true },
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'alarm_tool_settings', modelName: 'AlarmToolSettings', createdAt: false },
  );
  AlarmCategoryRule.init(
    {
      category: { type: DataTypes.TINYINT.UNSIGNED, primaryKey: true },
      rule: { type: rule, allowNull: false },
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'alarm_category_rules', modelName: 'AlarmCategoryRule', createdAt: false },
  );
  CounterReading.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      senderId: { type: DataTypes.STRING(100), allowNull: false },
      counter: { type: DataTypes.STRING(40), allowNull: false },
      value: { type: DataTypes.DOUBLE, allowNull: false },
      at: { type: DataTypes.DATE(3), allowNull: false },
      isReset: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      receivedAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'counter_readings', modelName: 'CounterReading', timestamps: false },
  );
}
