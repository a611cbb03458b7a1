import { DataTypes, Model, type Sequelize } from 'sequelize';

export class PushSubscription extends Model {
  declare id: number;
  declare userId: number;
  declare endpoint: string;
  declare endpointHash: string;
  declare p256dh: string;
  declare auth: string;
  declare createdAt: Date;
  declare updatedAt: Date;
}

export class PushOutbox extends Model {
  declare id: number;
  declare subscriptionId: number;
  declare payload: string;
  declare status: 'pending' | 'sent' | 'gone';
  declare attempts: number;
  declare nextAttemptAt: Date;
  declare lastError: string | null;
  declare sentAt: Date | null;
  declare createdAt: Date;
  declare subscription?: PushSubscription;
}

export class ServerKey extends Model {
  declare name: string;
  declare value: string;
  declare createdAt: Date;
}

export function initPushModels(sequelize: Sequelize) {
  PushSubscription.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      endpoint: { type: DataTypes.STRING(2000), allowNull: false },
      endpointHash: { type: DataTypes.CHAR(64), allowNull: false },
      p256dh: { type: DataTypes.STRING(200), allowNull: false },
      auth: { type: DataTypes.STRING(100), allowNull: false },
    },
    { sequelize, tableName: 'push_subscriptions', underscored: true },
  );
  PushOutbox.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      subscriptionId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
      payload: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.ENUM('pending', 'sent', 'gone'), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      nextAttemptAt: { type: DataTypes.DATE(3), allowNull: false },
      lastError: { type: DataTypes.STRING(1000), allowNull: true },
      sentAt: { type: DataTypes.DATE(3), allowNull: true },
    },
    { sequelize, tableName: 'push_outbox', underscored: true, updatedAt: false },
  );
  ServerKey.init(
    {
      name: { type: DataTypes.STRING(60), primaryKey: true },
      value: { type: DataTypes.TEXT, allowNull: false },
    },
    { sequelize, tableName: 'server_keys', underscored: true, updatedAt: false },
  );
  PushOutbox.belongsTo(PushSubscription, { as: 'subscription', foreignKey: 'subscriptionId' });
}
