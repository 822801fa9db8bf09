/**
 * The content security policy of the app's pages, one for both carriers: the
 * Electron window (main/desktop) and the browser-mode server (main/server).
 * A module of its own so the server does not depend on the window's code.
 */

/** Strict policy: nothing inline, nothing from elsewhere. */
export function contentSecurityPolicy(extraConnectSrc: readonly string[] = []): string {
  return [
    "default-src 'self'",
    "script-src 'self'",
    "style-src 'self'",
    "img-src 'self' data:",
    "font-src 'self'",
    `connect-src ${["'self'", ...extraConnectSrc].join(' ')}`,
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'none'",
    "frame-ancestors 'none'",
  ].join('; ');
}
