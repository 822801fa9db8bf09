import { describe, expect, it } from 'vitest';
import { contentSecurityPolicy, mainWindowOptions } from './window-options.ts';

// Electron security checklist (electronjs.org/docs/latest/tutorial/security),
// items "Enable context isolation", "Enable process sandboxing", "Do not enable
// Node.js integration for remote content", "Do not disable webSecurity",
// "Do not enable allowRunningInsecureContent", "Do not enable experimental
// features", "Do not use <webview>", "Define a Content Security Policy".
describe('desktop window options', () => {
  const options = mainWindowOptions('/app/out/preload/preload.cjs');
  const prefs = options.webPreferences;

  it('isolates and sandboxes the renderer, with no Node anywhere', () => {
    expect(prefs.contextIsolation).toBe(true);
    expect(prefs.sandbox).toBe(true);
    expect(prefs.nodeIntegration).toBe(false);
    expect(prefs.nodeIntegrationInWorker).toBe(false);
    expect(prefs.nodeIntegrationInSubFrames).toBe(false);
  });

  it('keeps web security on and the risky features off', () => {
    expect(prefs.webSecurity).toBe(true);
    expect(prefs.allowRunningInsecureContent).toBe(false);
    expect(prefs.experimentalFeatures).toBe(false);
    expect(prefs.webviewTag).toBe(false);
    expect(prefs.preload).toBe('/app/out/preload/preload.cjs');
  });

  it('sets no other webPreferences than the checked ones', () => {
    expect(Object.keys(prefs).sort()).toEqual(
      [
        'allowRunningInsecureContent',
        'contextIsolation',
        'experimentalFeatures',
        'nodeIntegration',
        'nodeIntegrationInSubFrames',
        'nodeIntegrationInWorker',
        'preload',
        'sandbox',
        'spellcheck',
        'webSecurity',
        'webviewTag',
      ].sort(),
    );
  });

  it('has a strict Content-Security-Policy: nothing inline, nothing from elsewhere', () => {
    const csp = contentSecurityPolicy();
    const directives = new Map(csp.split('; ').map((d) => [d.split(' ')[0], d.split(' ').slice(1).join(' ')]));
    expect(directives.get('default-src')).toBe("'self'");
    expect(directives.get('script-src')).toBe("'self'");
    expect(directives.get('style-src')).toBe("'self'");
    expect(directives.get('img-src')).toBe("'self' data:");
    expect(directives.get('connect-src')).toBe("'self'");
    expect(directives.get('object-src')).toBe("'none'");
    expect(directives.get('frame-ancestors')).toBe("'none'");
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval|\*/);
    expect(contentSecurityPolicy(['ws://127.0.0.1:7788'])).toContain("connect-src 'self' ws://127.0.0.1:7788");
  });
});
