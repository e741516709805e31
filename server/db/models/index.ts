// Every model is initialised here and every association is declared here, in one place.
import type { Sequelize } from 'sequelize';
import { initSession, Session } from './session';
import { initUser, User } from './user';

export { Session, User };

export function initModels(sequelize: Sequelize) {
  initUser(sequelize);
  initSession(sequelize);
}
