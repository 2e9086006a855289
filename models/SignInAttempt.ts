import {
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';

/** One row per sign-in attempt; the rate limit counts recent failures per e-mail and per address. */
export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<string>;
  declare email: string;
  declare address: string;
  declare succeeded: boolean;
  /** The known-device cookie's id when the attempt came from a device that signed in before. */
  declare deviceId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SignInAttempt.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        email: { type: DataTypes.STRING(254), allowNull: false },
        address: { type: DataTypes.STRING(64), allowNull: false },
        succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
        deviceId: { type: DataTypes.STRING(32), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'SignInAttempt', tableName: 'sign_in_attempts', underscored: true, updatedAt: false },
    );
  }
}
