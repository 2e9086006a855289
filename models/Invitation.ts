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
import type { Role } from './Membership';
import type { User } from './User';

export type InvitationStatus = 'pending' | 'accepted' | 'revoked';
/** queued: waiting for the job worker; sent: the SMTP server took it; not-sent: every try failed (resend). */
export type InvitationDelivery = 'queued' | 'sent' | 'not-sent';

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>;
  declare coopId: ForeignKey<Coop['id']>;
  declare email: string;
  /** The name given by whoever invited (a bulk import's file); null when invited by address only. */
  declare name: CreationOptional<string | null>;
  declare role: Role;
  /** SHA-256 of the token in the e-mailed link; the token itself is never stored. */
  declare tokenHash: string;
  declare status: CreationOptional<InvitationStatus>;
  declare delivery: CreationOptional<InvitationDelivery>;
  /** The bulk import this invitation came from, if any. */
  declare importId: CreationOptional<number | null>;
  declare invitedByUserId: ForeignKey<User['id']> | null;
  declare expiresAt: Date;
  declare acceptedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare coop?: NonAttribute<Coop>;
  declare invitedBy?: NonAttribute<User>;

  static initModel(sequelize: Sequelize) {
    Invitation.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        email: { type: DataTypes.STRING(254), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: true },
        importId: { type: DataTypes.INTEGER, allowNull: true },
        role: { type: DataTypes.STRING(20), allowNull: false },
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
        status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'pending' },
        delivery: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'not-sent' },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        acceptedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, modelName: 'Invitation', tableName: 'invitations', underscored: true },
    );
  }
}
