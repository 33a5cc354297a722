import { randomBytes, scrypt, timingSafeEqual } from 'node:crypto';

/**
 * Passwords are hashed with scrypt (memory-hard): N = 2^15, r = 8, p = 1 takes 32 MiB and about
 * 0.1 s per check here, which makes guessing from a stolen database slow. Parameters travel
 * inside the stored string so they can be raised later without breaking old hashes.
 */
const defaultLogN = 15;
const blockSize = 8;
const parallelism = 1;
const keyBytes = 32;

function scryptAsync(password: string, salt: Buffer, logN: number, r: number, p: number): Promise<Buffer> {
  return new Promise((resolvePromise, reject) => {
    const n = 2 ** logN;
    scrypt(password.normalize('NFC'), salt, keyBytes, { N: n, r, p, maxmem: 256 * n * r + 1024 * 1024 }, (error, key) => (error ? reject(error) : resolvePromise(key)));
  });
}

/** Hashes a password as `scrypt$logN$r$p$salt$key` (base64url parts). */
export async function hashPassword(password: string, logN = defaultLogN): Promise<string> {
  const salt = randomBytes(16);
  const key = await scryptAsync(password, salt, logN, blockSize, parallelism);
  return ['scrypt', logN, blockSize, parallelism, salt.toString('base64url'), key.toString('base64url')].join('$');
}

/** True when the password matches the stored hash; compares in constant time. */
export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [scheme, logN, r, p, salt, key] = stored.split('$');
  if (scheme !== 'scrypt' || !logN || !r || !p || !salt || !key) return false;
  const expected = Buffer.from(key, 'base64url');
  const actual = await scryptAsync(password, Buffer.from(salt, 'base64url'), Number(logN), Number(r), Number(p));
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}

/** A hash no password matches, checked when the username is unknown so that answer takes as long as a wrong password. */
export const unmatchableHash = `scrypt$${defaultLogN}$${blockSize}$${parallelism}$${Buffer.alloc(16).toString('base64url')}$${Buffer.alloc(keyBytes).toString('base64url')}`;
