// The model registry: every model is initialised here and its associations declared once.
import type { Sequelize } from 'sequelize';
import { User } from './User';

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize);
  return { User };
}

export { User };
