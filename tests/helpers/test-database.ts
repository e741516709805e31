// Each API/browser test file gets a database of its own, created before it and dropped after it.
import { randomBytes } from 'node:crypto';
import { createConnection } from 'mariadb';
import { afterAll } from 'vitest';

const name = `rigshelf_t_${process.pid}_${randomBytes(4).toString('hex')}`;
process.env.DB_NAME = name;

function connect() {
  return createConnection({
    host: process.env.DB_HOST,
    port: Number(process.env.DB_PORT),
    user: process.env.DB_USER,
    password: process.env.DB_PASSWORD,
  });
}

const conn = await connect();
await conn.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
await conn.end();

afterAll(async () => {
  const c = await connect();
  await c.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await c.end();
});
