import { DataTypes, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { PublicUser, Role } from '../../../shared/schemas/user.js';

/** A row of `users`. */
export interface UserRow extends Model<InferAttributes<UserRow>, InferCreationAttributes<UserRow>> {
  id: CreationOptional<number>;
  email: string;
  name: string;
  role: Role;
  passwordHash: string;
  disabled: CreationOptional<boolean>;
  createdAt: CreationOptional<Date>;
  updatedAt: CreationOptional<Date>;
}
export type UserModel = ModelStatic<UserRow>;

/** Defines the User model on this Sequelize instance (the table comes from migration 0001). */
export function defineUser(sequelize: Sequelize): UserModel {
  return sequelize.define<UserRow>(
    'User',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.ENUM('viewer', 'technician', 'admin'), allowNull: false },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { tableName: 'users' },
  );
}

/** The user as the API shows it: never the hash. */
export function toPublicUser(row: UserRow): PublicUser {
  return { id: row.id, email: row.email, name: row.name, role: row.role, disabled: Boolean(row.disabled) };
}
