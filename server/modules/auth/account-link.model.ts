import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

// Account links and "mail me a link" requests belong to auth (account-links.service.ts); the
// users module knows nothing of them.

/** What a single-use account link is for (table password_resets). */
export type AccountLinkPurpose = 'reset' | 'invite' | 'sign_in';

export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare purpose: AccountLinkPurpose;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A "mail me a link" request, written the same way whether or not the address has an account. */
export class AccountMailRequest extends Model<InferAttributes<AccountMailRequest>, InferCreationAttributes<AccountMailRequest>> {
  declare id: CreationOptional<number>;
  declare kind: 'password_reset' | 'sign_in_link';
  declare email: string;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the account-link models (table names kept from when they lived beside users). */
export function initAccountLinkModels(sequelize: Sequelize) {
  PasswordReset.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      purpose: { type: DataTypes.ENUM('reset', 'invite', 'sign_in'), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      usedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'password_resets', modelName: 'PasswordReset' },
  );
  AccountMailRequest.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.ENUM('password_reset', 'sign_in_link'), allowNull: false },
      email: { type: DataTypes.STRING(254), allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'account_mail_requests', modelName: 'AccountMailRequest', updatedAt: false },
  );
}
