import { describe, expect, it } from 'vitest';
import { callChannel, type IpcOutcome } from './channels.ts';
import { createIpcGate, type IpcCallEvent, type IpcMainLike } from './gate.ts';
import { pdfFileName, setupPrintPdfIpc } from './print-pdf.ts';

type Handler = (event: IpcCallEvent, ...args: unknown[]) => Promise<IpcOutcome>;

function setup(choice: string | null) {
  const handlers = new Map<string, Handler>();
  const ipcMain: IpcMainLike = {
    handle: (c, l) => void handlers.set(c, l),
    removeHandler: (c) => void handlers.delete(c),
  };
  const gate = createIpcGate(ipcMain, (url) => url.startsWith('tunebench://app/'));
  gate.trust({ webContentsId: 3, send: () => undefined });
  const written: { path: string; bytes: number }[] = [];
  const asked: string[] = [];
  setupPrintPdfIpc(gate, {
    printToPdf: async (id) => new TextEncoder().encode(`%PDF-1.7 window ${id}`),
    chooseSavePath: async (_id, name) => (asked.push(name), choice),
    writeFile: async (path, data) => void written.push({ path, bytes: data.length }),
  });
  const call = (...args: unknown[]) =>
    (handlers.get(callChannel('printDatasheetPdf')) as Handler)(
      { sender: { id: 3 }, senderFrame: { url: 'tunebench://app/index.html', parent: null } },
      ...args,
    );
  return { call, written, asked };
}

describe('datasheet to PDF (desktop)', () => {
  it("prints the caller's own window and writes where the operator chose", async () => {
    const { call, written, asked } = setup('/home/op/gain-table.pdf');
    await expect(call('gain-table')).resolves.toEqual({ ok: true, result: { savedTo: '/home/op/gain-table.pdf' } });
    expect(asked).toEqual(['gain-table.pdf']);
    expect(written).toEqual([{ path: '/home/op/gain-table.pdf', bytes: '%PDF-1.7 window 3'.length }]);
  });

  it('writes nothing when the dialog is cancelled', async () => {
    const { call, written } = setup(null);
    await expect(call('gain-table.pdf')).resolves.toEqual({ ok: true, result: { savedTo: null } });
    expect(written).toEqual([]);
  });

  it('refuses a suggested name with a folder in it', async () => {
    const { call, written } = setup('/x.pdf');
    await expect(call('../../etc/x.pdf')).resolves.toMatchObject({ ok: false, error: { field: 'fileName' } });
    expect(written).toEqual([]);
    expect(pdfFileName('sheet.PDF')).toBe('sheet.PDF');
  });
});
