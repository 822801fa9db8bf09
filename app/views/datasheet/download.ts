/** Saves text as a file through the browser's download (works in Electron too). */
import { downloadBlob } from '../../plots/download-blob.ts';

export function downloadText(fileName: string, text: string, mimeType: string): void {
  downloadBlob(fileName, new Blob([text], { type: mimeType }));
}
