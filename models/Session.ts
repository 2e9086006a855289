import {
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';

/**
 * One signed-in browser. The session cookie carries a random id; this row keeps its SHA-256.
 * A session counts while it is not revoked (sign-out, sign-out everywhere, password change),
 * not past `expiresAt` (30 days after sign-in) and not idle (lib/auth/sessions.ts).
 */
export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: CreationOptional<string>;
  declare tokenHash: string;
  declare userId: number;
  declare createdAt: CreationOptional<Date>;
  declare lastSeenAt: CreationOptional<Date>;
  declare expiresAt: Date;
  declare revokedAt: CreationOptional<Date | null>;
  declare userAgent: CreationOptional<string>;

  static initModel(sequelize: Sequelize) {
    Session.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        createdAt: DataTypes.DATE,
        lastSeenAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        userAgent: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      },
      { sequelize, modelName: 'Session', tableName: 'sessions', underscored: true, updatedAt: false },
    );
  }
}
