/**
 * Which page URLs are the app's own: the `tunebench://app/…` scheme, or —
 * only under `electron-vite dev` — the dev server's origin. Origins are
 * compared whole: a prefix test let `http://localhost:5173.evil.example/`
 * pass for `http://localhost:5173`.
 */
import { APP_ORIGIN } from '../window-options.ts';

function originOf(url: string): string | null {
  try {
    const parsed = new URL(url);
    // Custom schemes report origin "null"; build it from protocol and host instead.
    return `${parsed.protocol}//${parsed.host}`;
  } catch {
    return null;
  }
}

export function isAppUrl(url: string, devUrl: string | undefined): boolean {
  const origin = originOf(url);
  if (origin === null) return false;
  if (origin === APP_ORIGIN && url.startsWith(`${APP_ORIGIN}/`)) return true;
  return devUrl !== undefined && devUrl !== '' && origin === originOf(devUrl);
}

/**
 * Whether an origin as Electron's permission handlers report it
 * (`tunebench://app`, sometimes with a trailing slash) is the app's own —
 * or the dev server's, under `electron-vite dev`. Nothing but an origin may
 * follow: a path, query or credentials mean it is not one.
 */
export function isAppOrigin(origin: string, devUrl: string | undefined): boolean {
  let parsed: URL;
  try {
    parsed = new URL(origin);
  } catch {
    return false;
  }
  if (parsed.username !== '' || parsed.password !== '' || parsed.search !== '' || parsed.hash !== '') return false;
  if (parsed.pathname !== '' && parsed.pathname !== '/') return false;
  const bare = `${parsed.protocol}//${parsed.host}`;
  if (bare === APP_ORIGIN) return true;
  return devUrl !== undefined && devUrl !== '' && bare === originOf(devUrl);
}
