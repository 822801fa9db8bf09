/**
 * Security settings of the desktop window, as plain data, so a test can read
 * them without importing Electron (nothing in the tests may launch it).
 * main/index.ts spreads these into `new BrowserWindow(...)`.
 * Browser mode (main/server/) serves the same Content-Security-Policy.
 */

/** Custom scheme the desktop app serves the renderer from (never file://). */
export const APP_SCHEME = 'tunebench';
export const APP_ORIGIN = `${APP_SCHEME}://app`;

export { contentSecurityPolicy } from './content-security-policy.ts';

export interface SecureWebPreferences {
  preload: string;
  contextIsolation: true;
  sandbox: true;
  nodeIntegration: false;
  nodeIntegrationInWorker: false;
  nodeIntegrationInSubFrames: false;
  webSecurity: true;
  allowRunningInsecureContent: false;
  experimentalFeatures: false;
  webviewTag: false;
  spellcheck: false;
}

export interface MainWindowOptions {
  width: number;
  height: number;
  minWidth: number;
  minHeight: number;
  title: string;
  show: boolean;
  backgroundColor: string;
  webPreferences: SecureWebPreferences;
}

export function mainWindowOptions(preloadPath: string): MainWindowOptions {
  return {
    width: 1280,
    height: 840,
    minWidth: 900,
    minHeight: 600,
    title: 'tunebench',
    // Shown on 'ready-to-show' so the operator never sees a blank frame.
    show: false,
    backgroundColor: '#15181c',
    webPreferences: {
      preload: preloadPath,
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      experimentalFeatures: false,
      webviewTag: false,
      spellcheck: false,
    },
  };
}
