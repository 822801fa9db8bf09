/**
 * The desktop app loads its renderer from `tunebench://app/…`, never from
 * file://, so every page and asset comes with the Content-Security-Policy
 * and the other security headers, and nothing outside out/renderer can be
 * fetched through it.
 */
import { protocol } from 'electron';
import { readStaticFile } from '../server/static-files.ts';
import { APP_SCHEME, contentSecurityPolicy } from '../window-options.ts';

/** Must run before the app is ready. */
export function registerAppScheme(): void {
  // standard + secure: a real origin (tunebench://app) with the rights of https,
  // so module scripts and workers load from it; nothing else is granted.
  protocol.registerSchemesAsPrivileged([
    { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true, corsEnabled: true } },
  ]);
}

export const DESKTOP_HEADERS: Readonly<Record<string, string>> = {
  'Content-Security-Policy': contentSecurityPolicy(),
  'X-Content-Type-Options': 'nosniff',
  'Referrer-Policy': 'no-referrer',
  'Cross-Origin-Opener-Policy': 'same-origin',
};

export function serveRendererOnAppScheme(rendererDir: string): void {
  protocol.handle(APP_SCHEME, async (request) => {
    const url = new URL(request.url);
    const file =
      url.host === 'app' && request.method === 'GET' ? await readStaticFile(rendererDir, url.pathname) : null;
    if (!file)
      return new Response('Not found', { status: 404, headers: { ...DESKTOP_HEADERS, 'Content-Type': 'text/plain' } });
    return new Response(new Uint8Array(file.body), {
      status: 200,
      headers: { ...DESKTOP_HEADERS, 'Content-Type': file.contentType },
    });
  });
}
