/**
 * Electron security checklist items that apply to every web contents the
 * app ever creates: no navigation away from the app, no new windows, no
 * <webview>, no permission grants but Web Serial ports the user chose in the
 * main-process chooser (serial-access.ts), and the CSP header on anything
 * loaded over http(s) (the dev server).
 */
import { app, session, type WebContents } from 'electron';
import { contentSecurityPolicy } from '../window-options.ts';
import { installSerialAccess, type SerialAccessOptions } from './serial-access.ts';

export function guardWebContents(contents: WebContents): void {
  contents.on('will-navigate', (event) => event.preventDefault());
  contents.on('will-redirect', (event) => event.preventDefault());
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(() => ({ action: 'deny' }));
}

export function hardenSessionAndContents(serial: SerialAccessOptions<WebContents>): void {
  app.on('web-contents-created', (_event, contents) => guardWebContents(contents));
  const ses = session.defaultSession;
  installSerialAccess(ses, serial);
  ses.webRequest.onHeadersReceived((details, callback) => {
    callback({
      responseHeaders: {
        ...details.responseHeaders,
        'Content-Security-Policy': [contentSecurityPolicy()],
        'X-Content-Type-Options': ['nosniff'],
      },
    });
  });
}
