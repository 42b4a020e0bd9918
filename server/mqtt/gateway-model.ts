import { DataTypes, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** A row of `gateways` (migration 1650). */
export interface GatewayRow extends Model<InferAttributes<GatewayRow>, InferCreationAttributes<GatewayRow>> {
  id: CreationOptional<number>;
  name: string;
  /** The broker's salted hash of the password (mosquitto_passwd's format); the password itself is never kept. */
  passwordHash: string;
  revokedAt: CreationOptional<Date | null>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}
export type GatewayModel = ModelStatic<GatewayRow>;

const MODEL_NAME = 'Gateway';

/** The Gateway model on `sequelize`, defined on first use. */
export function gatewayModel(sequelize: Sequelize): GatewayModel {
  if (sequelize.isDefined(MODEL_NAME)) return sequelize.model(MODEL_NAME) as GatewayModel;
  return sequelize.define<GatewayRow>(
    MODEL_NAME,
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(40), allowNull: false, unique: true },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { tableName: 'gateways' },
  );
}
