import { createHash, randomBytes } from 'node:crypto';

/** A new bearer token: 32 random bytes, base64url. It means nothing by itself; the server looks it up. */
export function newOpaqueToken(): string {
  return randomBytes(32).toString('base64url');
}

/** SHA-256 of a token, as stored: a copied database holds no usable session or device token. */
export function tokenHash(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}
