import {
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';
import type { Coop } from './Coop';
import type { User } from './User';

/**
 * A personal access token for an integration: one co-op, read-only or read-write, acting with
 * its creator's current role there. Keeps the token's SHA-256, never the token (lib/auth/api-tokens.ts).
 */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare createdByUserId: ForeignKey<User['id']>;
  declare name: string;
  declare access: 'read' | 'write';
  declare tokenHash: string;
  declare prefix: string;
  declare createdAt: CreationOptional<Date>;
  declare lastUsedAt: CreationOptional<Date | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare coop?: NonAttribute<Coop>;
  declare createdBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    ApiToken.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(80), allowNull: false },
        access: { type: DataTypes.STRING(5), allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        prefix: { type: DataTypes.STRING(16), allowNull: false },
        createdAt: DataTypes.DATE,
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, modelName: 'ApiToken', tableName: 'api_tokens', underscored: true, updatedAt: false },
    );
  }
}
