/**
 * Response headers for every HTTP answer of browser mode. The policy is the
 * same as the desktop window's: scripts, styles and connections only from
 * the page's own origin (the WebSocket is named explicitly because older
 * engines do not count ws: as 'self'), no framing, no referrer (the page URL
 * carries the access token, which must never leak to another site).
 */
import { contentSecurityPolicy } from '../content-security-policy.ts';

export function securityHeaders(origin: string): Record<string, string> {
  const wsOrigin = origin.replace(/^http:/, 'ws:');
  return {
    'Content-Security-Policy': contentSecurityPolicy([wsOrigin]),
    'X-Content-Type-Options': 'nosniff',
    'X-Frame-Options': 'DENY',
    'Referrer-Policy': 'no-referrer',
    'Cross-Origin-Opener-Policy': 'same-origin',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'Permissions-Policy': 'camera=(), microphone=(), geolocation=(), usb=(), serial=()',
    'Cache-Control': 'no-store',
  };
}
