import { Sequelize } from 'sequelize';
import type { Config } from '../config';
import { createHostChooser, useHosts } from './hosts';
import { initModels } from './models';

/** Where the database is, for messages: DB_HOSTS as given, else DB_HOST:DB_PORT. */
export function databaseAddress(config: Config): string {
  return config.DB_HOSTS ? config.DB_HOSTS.map((h) => `${h.host}:${h.port}`).join(', ') : `${config.DB_HOST}:${config.DB_PORT}`;
}

export function createSequelize(config: Config): Sequelize {
  const sequelize = new Sequelize(config.DB_NAME, config.DB_USER, config.DB_PASSWORD, {
    host: config.DB_HOSTS?.[0].host ?? config.DB_HOST,
    port: config.DB_HOSTS?.[0].port ?? config.DB_PORT,
    dialect: 'mariadb',
    logging: false,
    // Fail fast while the database is down or does not answer, so /api/health can say so and
    // requests get a 503: connectTimeout covers the TCP connect only; socketTimeout (any silence on
    // an open connection, the handshake included) catches a frozen server; queryTimeout lets a live
    // server stop a runaway statement first, with a clean error.
    dialectOptions: {
      connectTimeout: 3000,
      ...(config.DB_QUERY_TIMEOUT_MS > 0 && { queryTimeout: config.DB_QUERY_TIMEOUT_MS, socketTimeout: config.DB_QUERY_TIMEOUT_MS + 1000 }),
    },
    timezone: '+00:00',
    // idle connections leave the pool well before socketTimeout would end them there
    pool: {
      max: config.DB_POOL_MAX,
      min: 0,
      acquire: 5000,
      idle: config.DB_QUERY_TIMEOUT_MS > 0 ? Math.min(10_000, Math.max(1000, config.DB_QUERY_TIMEOUT_MS / 2)) : 10_000,
    },
    define: { underscored: true },
  });
  // several servers: each new connection goes to the one in use, or the next that answers
  if (config.DB_HOSTS) useHosts(sequelize, createHostChooser(config.DB_HOSTS));
  initModels(sequelize);
  return sequelize;
}
