import type { Sequelize } from 'sequelize';
import { defineUser, type UserModel } from './user.js';
import { defineBattery, type BatteryModel } from './battery.js';
import { defineLabSettings, type LabSettingsModel } from './lab-settings.js';

/** The foundation's models, bound to one Sequelize instance (no global model classes). */
export interface CoreModels {
  User: UserModel;
  Battery: BatteryModel;
  LabSettings: LabSettingsModel;
}

/** Defines the foundation's models on `sequelize`. */
export function defineCoreModels(sequelize: Sequelize): CoreModels {
  return { User: defineUser(sequelize), Battery: defineBattery(sequelize), LabSettings: defineLabSettings(sequelize) };
}
