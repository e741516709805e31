// Password hashing with Node's scrypt (memory-hard), a random salt per password, and the cost stored
// beside the hash so it can be raised later without breaking existing accounts.
import { randomBytes, scrypt as scryptCb, timingSafeEqual, type ScryptOptions } from 'node:crypto';

const KEY_LENGTH = 32;
const R = 8;
const P = 1;

function scrypt(password: string, salt: Buffer, N: number): Promise<Buffer> {
  const options: ScryptOptions = { N, r: R, p: P, maxmem: 256 * N * R + 1024 * 1024 };
  return new Promise((resolve, reject) => scryptCb(password.normalize('NFKC'), salt, KEY_LENGTH, options, (err, key) => (err ? reject(err) : resolve(key))));
}

export async function hashPassword(password: string, logN: number): Promise<string> {
  const salt = randomBytes(16);
  const N = 2 ** logN;
  const key = await scrypt(password, salt, N);
  return `scrypt$${logN}$${R}$${P}$${salt.toString('base64url')}$${key.toString('base64url')}`;
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [scheme, logN, , , salt, key] = stored.split('$');
  if (scheme !== 'scrypt' || !salt || !key) return false;
  const expected = Buffer.from(key, 'base64url');
  const actual = await scrypt(password, Buffer.from(salt, 'base64url'), 2 ** Number(logN));
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}

/** A hash to verify against when the account does not exist, so timing does not reveal that. */
let dummy: Promise<string> | undefined;
export function dummyHash(logN: number): Promise<string> {
  dummy ??= hashPassword(randomBytes(12).toString('hex'), logN);
  return dummy;
}
