/**
 * Electron main process: one window on the renderer (sandboxed, isolated,
 * no Node), the IPC gate with one setup per feature, and the BenchApi
 * service. On quit any run is stopped and the supply left safe before the
 * process exits.
 */
import { writeFile } from 'node:fs/promises';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { app, BrowserWindow, dialog, ipcMain, webContents } from 'electron';
import { BENCH_METHODS } from '../app/contract/wire.ts';
import { registerAppScheme, serveRendererOnAppScheme } from './desktop/app-protocol.ts';
import { isAppOrigin, isAppUrl } from './desktop/app-url.ts';
import { hardenSessionAndContents } from './desktop/harden.ts';
import { serialChooserDialog } from './desktop/serial-chooser.ts';
import { createIpcGate, setupBenchIpc } from './ipc/gate.ts';
import { setupPrintPdfIpc } from './ipc/print-pdf.ts';
import { parseAllowedHosts } from './service/address-policy.ts';
import { createDefaultBenchService } from './service/default-ports.ts';
import { installLastResortGuard } from './service/last-resort-guard.ts';
import { resolveRunsDir } from './store/index.ts';
import { APP_ORIGIN, mainWindowOptions } from './window-options.ts';

const rendererDir = fileURLToPath(new URL('../renderer', import.meta.url));
const preloadPath = fileURLToPath(new URL('../preload/preload.cjs', import.meta.url));
// electron-vite's dev server, when running `electron-vite dev`.
const devUrl = process.env.ELECTRON_RENDERER_URL;

const isOwnPage = (url: string): boolean => isAppUrl(url, devUrl);

registerAppScheme();
// One app per machine: two processes must never drive the same instruments.
if (!app.requestSingleInstanceLock()) app.exit(0);

const service = createDefaultBenchService({
  runsDir: resolveRunsDir(undefined, process.env, process.platform, homedir()),
  // Instruments beyond loopback, private LANs and serial devices only when the user says so.
  addressPolicy: { extraHosts: parseAllowedHosts(process.env.TUNEBENCH_ALLOW_ADDRESS) },
});
const gate = createIpcGate(ipcMain, isOwnPage);
// The desktop process holds the bench too: a crash, a signal or a heap near its limit leaves the supply safe first.
installLastResortGuard({
  source: process,
  holder: service,
  log: (line) => console.error(line),
  exit: (code) => app.exit(code),
});

function createWindow(): BrowserWindow {
  const window = new BrowserWindow(mainWindowOptions(preloadPath));
  const contents = window.webContents;
  const untrust = gate.trust({
    webContentsId: contents.id,
    send: (channel, payload) => contents.send(channel, payload),
  });
  window.on('closed', untrust);
  window.once('ready-to-show', () => window.show());
  void window.loadURL(devUrl ?? `${APP_ORIGIN}/index.html`);
  return window;
}

function setupFeatures(): void {
  setupBenchIpc(gate, service, BENCH_METHODS);
  setupPrintPdfIpc(gate, {
    printToPdf: async (id) => {
      const contents = webContents.fromId(id);
      if (!contents) throw new Error('the window asking to print is gone');
      return contents.printToPDF({ printBackground: true, pageSize: 'A4' });
    },
    chooseSavePath: async (id, suggestedName) => {
      const contents = webContents.fromId(id);
      const owner = contents ? BrowserWindow.fromWebContents(contents) : null;
      const options = {
        defaultPath: join(app.getPath('documents'), suggestedName),
        filters: [{ name: 'PDF', extensions: ['pdf'] }],
      };
      const choice = owner ? await dialog.showSaveDialog(owner, options) : await dialog.showSaveDialog(options);
      return choice.canceled || !choice.filePath ? null : choice.filePath;
    },
    writeFile: (path, data) => writeFile(path, data),
  });
}

let closedSafely = false;
app.on('before-quit', (event) => {
  if (closedSafely) return;
  event.preventDefault();
  void service
    .close()
    .catch((error: unknown) => console.error('tunebench: closing the bench failed:', error))
    .finally(() => {
      closedSafely = true;
      gate.dispose();
      app.quit();
    });
});
app.on('window-all-closed', () => app.quit());
app.on('second-instance', () => BrowserWindow.getAllWindows()[0]?.focus());

void app.whenReady().then(() => {
  hardenSessionAndContents({
    isAppOrigin: (origin) => isAppOrigin(origin, devUrl),
    isOwnPage,
    // Web Serial: the user picks the port here, in the main process; the page cannot grant itself one.
    choosePort: async (ports, contents) => {
      const { options, portAt } = serialChooserDialog(ports);
      const owner = BrowserWindow.fromWebContents(contents);
      const choice = owner ? await dialog.showMessageBox(owner, options) : await dialog.showMessageBox(options);
      return portAt(choice.response);
    },
    log: (line) => console.error(line),
  });
  serveRendererOnAppScheme(rendererDir);
  setupFeatures();
  createWindow();
  app.on('activate', () => {
    if (BrowserWindow.getAllWindows().length === 0) createWindow();
  });
});
