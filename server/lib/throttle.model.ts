import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Fixed-window counters used by sign-in throttling and rate limits. */
export class Throttle extends Model<InferAttributes<Throttle>, InferCreationAttributes<Throttle>> {
  declare key: string;
  declare hits: number;
  declare windowStartedAt: Date;
}

export function initThrottleModel(sequelize: Sequelize) {
  Throttle.init(
    {
      key: { type: DataTypes.STRING(191), primaryKey: true },
      hits: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      windowStartedAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'throttles', modelName: 'Throttle', timestamps: false },
  );
}
