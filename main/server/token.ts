/**
 * The access token of browser mode: 32 random bytes, base64url. Compared in
 * constant time (both sides hashed first so unequal lengths take the same
 * path as equal ones and the comparison never leaks a prefix).
 */
import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

export const TOKEN_COOKIE = 'tunebench_token';

export function createAccessToken(): string {
  return randomBytes(32).toString('base64url');
}

function digest(text: string): Buffer {
  return createHash('sha256').update(text, 'utf8').digest();
}

export function tokenMatches(expected: string, offered: string | null | undefined): boolean {
  if (typeof offered !== 'string' || offered.length === 0 || offered.length > 512) return false;
  return timingSafeEqual(digest(expected), digest(offered));
}

/** Reads one cookie's value from a Cookie header; null when absent. */
export function readCookie(header: string | undefined, name: string): string | null {
  if (!header) return null;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq < 0) continue;
    if (part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return null;
}
