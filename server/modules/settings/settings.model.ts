import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MemberTicketVisibility } from '../../../shared/schemas/facility-settings';

/** The single row (id 1) of facility-wide settings. */
export class FacilitySettingsRow extends Model<InferAttributes<FacilitySettingsRow>, InferCreationAttributes<FacilitySettingsRow>> {
  declare id: number;
  declare facilityName: string;
  declare timeZone: string;
  declare emergencyNumber: string;
  declare localProcedure: string;
  declare memberTicketVisibility: MemberTicketVisibility;
  declare updatedById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initSettingsModel(sequelize: Sequelize) {
  FacilitySettingsRow.init(
    {
      id: { type: DataTypes.TINYINT.UNSIGNED, primaryKey: true },
      facilityName: { type: DataTypes.STRING(120), allowNull: false },
      timeZone: { type: DataTypes.STRING(64), allowNull: false },
      emergencyNumber: { type: DataTypes.STRING(40), allowNull: false },
      localProcedure: { type: DataTypes.TEXT, allowNull: false },
      memberTicketVisibility: { type: DataTypes.ENUM('all', 'own'), allowNull: false },
      updatedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'facility_settings', modelName: 'FacilitySettingsRow' },
  );
}
