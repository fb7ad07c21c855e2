// The model registry: every model is initialised here and its associations declared once.
import type { Sequelize } from 'sequelize';
import { User } from './User';
import { OutboxMail } from './OutboxMail';

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize);
  OutboxMail.initModel(sequelize);
  return { User, OutboxMail };
}

export { User, OutboxMail };
export type { OutboxAttachment } from './OutboxMail';
