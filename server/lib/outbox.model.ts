import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** 'dead' is no longer written (mail is retried for ever); migration 0015 revived old ones. */
export class OutboxMail extends Model<InferAttributes<OutboxMail>, InferCreationAttributes<OutboxMail>> {
  declare id: CreationOptional<number>;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string | null;
  declare status: CreationOptional<'pending' | 'sent' | 'dead'>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date;
  declare lastError: string | null;
  declare sentAt: Date | null;
  /** When admins were told that this mail is late (once per mail). */
  declare warnedAt: CreationOptional<Date | null>;
  /** Pending mail with the same key, not yet due, takes later messages in (see queueMail). */
  declare foldKey: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initOutboxModel(sequelize: Sequelize) {
  OutboxMail.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      toAddress: { type: DataTypes.STRING(320), allowNull: false },
      subject: { type: DataTypes.STRING(255), allowNull: false },
      textBody: { type: DataTypes.TEXT('medium'), allowNull: false },
      htmlBody: { type: DataTypes.TEXT('medium'), allowNull: true },
      status: { type: DataTypes.ENUM('pending', 'sent', 'dead'), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      nextAttemptAt: { type: DataTypes.DATE(3), allowNull: false },
      lastError: { type: DataTypes.STRING(1000), allowNull: true },
      sentAt: { type: DataTypes.DATE(3), allowNull: true },
      warnedAt: { type: DataTypes.DATE(3), allowNull: true },
      foldKey: { type: DataTypes.STRING(120), allowNull: true, defaultValue: null },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'outbox_mails', modelName: 'OutboxMail' },
  );
}
