import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { User } from './User';

export type AuthTokenKind = 'password-reset' | 'email-change';

/** Single-use, expiring tokens sent by e-mail (password reset, e-mail change). */
export class AuthToken extends Model<InferAttributes<AuthToken>, InferCreationAttributes<AuthToken>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User['id']>;
  declare kind: AuthTokenKind;
  declare tokenHash: string;
  declare newEmail: string | null;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    AuthToken.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
        newEmail: { type: DataTypes.STRING(254), allowNull: true },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        usedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'AuthToken', tableName: 'auth_tokens', underscored: true, updatedAt: false },
    );
  }
}
