import {
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';

/**
 * The e-mail send ledger (lib/mail/once.ts): one row per message handed to SMTP, keyed by what
 * it is (`invoice.42` and its n-th send, `mail.<job id>`). "sending" is the in-flight claim,
 * committed before the message goes out; "sent" is written right after the server's 250.
 */
export class MailSend extends Model<InferAttributes<MailSend>, InferCreationAttributes<MailSend>> {
  declare subject: string;
  declare generation: number;
  declare coopId: number | null;
  declare messageId: string;
  declare state: 'sending' | 'sent';
  declare claimedBy: string;
  declare tries: CreationOptional<number>;
  declare claimedAt: CreationOptional<Date>;
  declare sentAt: CreationOptional<Date | null>;

  static initModel(sequelize: Sequelize) {
    MailSend.init(
      {
        subject: { type: DataTypes.STRING(80), primaryKey: true },
        generation: { type: DataTypes.INTEGER, primaryKey: true },
        coopId: { type: DataTypes.INTEGER, allowNull: true },
        messageId: { type: DataTypes.STRING(200), allowNull: false, unique: true },
        state: { type: DataTypes.STRING(10), allowNull: false },
        claimedBy: { type: DataTypes.STRING(64), allowNull: false },
        tries: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        claimedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        sentAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, modelName: 'MailSend', tableName: 'mail_sends', underscored: true, timestamps: false },
    );
  }
}
