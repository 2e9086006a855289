import {
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  Model,
  DataTypes,
  type Sequelize,
} from 'sequelize';

/** An event received from the payments provider, stored once per event id. */
export class PaymentWebhookEvent extends Model<
  InferAttributes<PaymentWebhookEvent>,
  InferCreationAttributes<PaymentWebhookEvent>
> {
  declare id: CreationOptional<string>;
  declare stripeEventId: string;
  declare type: string;
  /** The co-op named in the event's metadata, NULL when it names none of ours. */
  declare coopId: number | null;
  declare objectId: string | null;
  declare outcome: string;
  declare payload: unknown;
  declare receivedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PaymentWebhookEvent.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        stripeEventId: { type: DataTypes.STRING(80), allowNull: false, unique: true },
        type: { type: DataTypes.STRING(80), allowNull: false },
        coopId: { type: DataTypes.INTEGER, allowNull: true },
        objectId: { type: DataTypes.STRING(80), allowNull: true },
        outcome: { type: DataTypes.STRING(40), allowNull: false },
        payload: { type: DataTypes.JSONB, allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      {
        sequelize,
        modelName: 'PaymentWebhookEvent',
        tableName: 'payment_webhook_events',
        underscored: true,
        timestamps: false,
      },
    );
  }
}
