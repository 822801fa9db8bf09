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
