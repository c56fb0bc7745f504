import { randomBytes, timingSafeEqual } from 'node:crypto';

/** A fresh token per launch: 256 random bits, URL-safe, so it can ride in the address fragment. */
export function newAccessToken(): string {
  return randomBytes(32).toString('base64url');
}

/** The token from `Authorization: Bearer ...` or `X-Holdfast-Token`, compared in constant time. */
export function carriesToken(headers: Record<string, string | string[] | undefined>, token: string): boolean {
  const auth = headers['authorization'];
  const bearer = typeof auth === 'string' && auth.startsWith('Bearer ') ? auth.slice(7).trim() : undefined;
  const custom = headers['x-holdfast-token'];
  const given = bearer ?? (typeof custom === 'string' ? custom : undefined);
  if (given === undefined) return false;
  const a = Buffer.from(given);
  const b = Buffer.from(token);
  return a.length === b.length && timingSafeEqual(a, b);
}
