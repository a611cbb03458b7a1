import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { E10_STATES, STATE_REASONS, type E10State, type StateReason } from '../../../shared/equipment-state';

export type Criticality = 'high' | 'normal' | 'low';

export class Area extends Model<InferAttributes<Area>, InferCreationAttributes<Area>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare code: string;
  declare description: string | null;
  declare sortOrder: CreationOptional<number>;
  declare retiredAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Tool extends Model<InferAttributes<Tool>, InferCreationAttributes<Tool>> {
  declare id: CreationOptional<number>;
  declare areaId: number;
  declare name: string;
  declare code: string;
  declare description: string | null;
  declare criticality: CreationOptional<Criticality>;
  declare primaryEngineerId: number | null;
  declare backupEngineerId: number | null;
  declare retiredAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ToolModule extends Model<InferAttributes<ToolModule>, InferCreationAttributes<ToolModule>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare name: string;
  declare code: string;
  declare sortOrder: CreationOptional<number>;
  declare retiredAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export type StateSource = 'staff' | 'user_report' | 'alarm' | 'schedule' | 'system';

/** One interval of the state log (module_id null = the tool itself). */
export class StateInterval extends Model<InferAttributes<StateInterval>, InferCreationAttributes<StateInterval>> {
  declare id: CreationOptional<number>;
  declare toolId: number;
  declare moduleId: number | null;
  declare state: E10State;
  declare reason: CreationOptional<StateReason>;
  declare note: string | null;
  /** A restriction in force while running (the board shows Limited); null when none. */
  declare restriction: CreationOptional<string | null>;
  declare startedAt: Date;
  declare endedAt: Date | null;
  declare expectedReturnAt: Date | null;
  declare ticketId: number | null;
  declare setById: number | null;
  declare source: CreationOptional<StateSource>;
  declare confirmed: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
}

export class ToolFollow extends Model<InferAttributes<ToolFollow>, InferCreationAttributes<ToolFollow>> {
  declare userId: number;
  declare toolId: number;
  declare unfollowToken: string;
  declare createdAt: CreationOptional<Date>;
}

export class DisplayLink extends Model<InferAttributes<DisplayLink>, InferCreationAttributes<DisplayLink>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare keyHash: string;
  declare createdById: number | null;
  declare revokedAt: Date | null;
  declare lastSeenAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const stamps = { createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) };

export function initFacilityModels(sequelize: Sequelize) {
  Area.init(
    {
      id,
      name: { type: DataTypes.STRING(120), allowNull: false },
      code: { type: DataTypes.STRING(24), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: true },
      sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      retiredAt: { type: DataTypes.DATE(3), allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'areas', modelName: 'Area' },
  );
  Tool.init(
    {
      id,
      areaId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      code: { type: DataTypes.STRING(32), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: true },
      criticality: { type: DataTypes.ENUM('high', 'normal', 'low'), allowNull: false, defaultValue: 'normal' },
      primaryEngineerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      backupEngineerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      retiredAt: { type: DataTypes.DATE(3), allowNull: true },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      ...stamps,
    },
    // version: true makes Sequelize check and bump `version` on every save (optimistic lock).
    { sequelize, tableName: 'tools', modelName: 'Tool', version: true },
  );
  ToolModule.init(
    {
      id,
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      code: { type: DataTypes.STRING(32), allowNull: false },
      sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      retiredAt: { type: DataTypes.DATE(3), allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'modules', modelName: 'ToolModule' },
  );
  StateInterval.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      moduleId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      state: { type: DataTypes.ENUM(...E10_STATES), allowNull: false },
      reason: { type: DataTypes.ENUM(...STATE_REASONS), allowNull: false, defaultValue: 'none' },
      note: { type: DataTypes.STRING(500), allowNull: true },
      restriction: { type: DataTypes.STRING(200), allowNull: true, defaultValue: null },
      startedAt: { type: DataTypes.DATE(3), allowNull: false },
      endedAt: { type: DataTypes.DATE(3), allowNull: true },
      expectedReturnAt: { type: DataTypes.DATE(3), allowNull: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      setById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      source: { type: DataTypes.ENUM('staff', 'user_report', 'alarm', 'schedule', 'system'), allowNull: false, defaultValue: 'staff' },
      confirmed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'state_intervals', modelName: 'StateInterval', updatedAt: false },
  );
  ToolFollow.init(
    {
      userId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      toolId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      unfollowToken: { type: DataTypes.CHAR(43), allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'tool_follows', modelName: 'ToolFollow', updatedAt: false },
  );
  DisplayLink.init(
    {
      id,
      name: { type: DataTypes.STRING(120), allowNull: false },
      keyHash: { type: DataTypes.CHAR(64), allowNull: false },
      createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      revokedAt: { type: DataTypes.DATE(3), allowNull: true },
      lastSeenAt: { type: DataTypes.DATE(3), allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'display_links', modelName: 'DisplayLink' },
  );

  Tool.belongsTo(Area, { as: 'area', foreignKey: 'areaId' });
  Area.hasMany(Tool, { as: 'tools', foreignKey: 'areaId' });
  ToolModule.belongsTo(Tool, { as: 'tool', foreignKey: 'toolId' });
  Tool.hasMany(ToolModule, { as: 'modules', foreignKey: 'toolId' });
  StateInterval.belongsTo(Tool, { as: 'tool', foreignKey: 'toolId' });
  StateInterval.belongsTo(ToolModule, { as: 'module', foreignKey: 'moduleId' });
}
