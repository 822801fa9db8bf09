/**
 * Feature setup: the datasheet printed to PDF (desktop app only). The
 * calling window prints its own page (the datasheet screen, with the print
 * stylesheet applied) and the operator picks where the file goes.
 */
import type { IpcGate } from './gate.ts';

export interface PrintPdfHost {
  /** Prints the page of the window whose webContents has this id. */
  printToPdf(webContentsId: number): Promise<Uint8Array>;
  /** Asks where to save; null when the operator cancels. */
  chooseSavePath(webContentsId: number, suggestedName: string): Promise<string | null>;
  writeFile(path: string, data: Uint8Array): Promise<void>;
}

export function pdfFileName(suggested: string): string {
  return /\.pdf$/i.test(suggested) ? suggested : `${suggested}.pdf`;
}

export function setupPrintPdfIpc(gate: IpcGate, host: PrintPdfHost): void {
  gate.handle('printDatasheetPdf', async ([fileName], caller) => {
    const pdf = await host.printToPdf(caller.webContentsId);
    const path = await host.chooseSavePath(caller.webContentsId, pdfFileName(String(fileName)));
    if (path === null) return { savedTo: null };
    await host.writeFile(path, pdf);
    return { savedTo: path };
  });
}
