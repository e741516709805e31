import { Sequelize } from 'sequelize';
import type { Config } from '../config';
import { initModels } from './models';

export function createSequelize(config: Config): Sequelize {
  const sequelize = new Sequelize(config.DB_NAME, config.DB_USER, config.DB_PASSWORD, {
    host: config.DB_HOST,
    port: config.DB_PORT,
    dialect: 'mariadb',
    logging: false,
    // Fail fast while the database is down so /api/health can say so and requests get a 503.
    dialectOptions: { connectTimeout: 3000 },
    timezone: '+00:00',
    pool: { max: config.DB_POOL_MAX, min: 0, acquire: 5000, idle: 10_000 },
    define: { underscored: true },
  });
  initModels(sequelize);
  return sequelize;
}
