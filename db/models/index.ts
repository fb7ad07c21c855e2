// The model registry: every model is initialised here and its associations declared once.
import type { Sequelize } from 'sequelize';
import { User } from './User';
import { OutboxMail } from './OutboxMail';
import { Instrument } from './Instrument';

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize);
  OutboxMail.initModel(sequelize);
  Instrument.initModel(sequelize);
  return { User, OutboxMail, Instrument };
}

export { User, OutboxMail, Instrument };
export type { OutboxAttachment } from './OutboxMail';
