import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export class Notice extends Model<InferAttributes<Notice>, InferCreationAttributes<Notice>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare kind: string;
  declare title: string;
  declare body: string | null;
  declare link: string | null;
  declare readAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

export function initNoticeModel(sequelize: Sequelize) {
  Notice.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      title: { type: DataTypes.STRING(200), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: true },
      link: { type: DataTypes.STRING(300), allowNull: true },
      readAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'notices', modelName: 'Notice', updatedAt: false },
  );
}
