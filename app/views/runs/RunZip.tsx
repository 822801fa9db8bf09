/**
 * Web edition only: a run folder out as a zip and zips back in, so a run
 * moves between the page, the desktop app and the CLI unchanged. Shown only
 * where the BenchApi has these verbs (web/page-bench.ts).
 */
import { useRef, useState } from 'react';
import { downloadBlob } from '../../plots/download-blob.ts';
import { useStore } from '../../state/use-store.ts';
import { useApp } from '../app-context.ts';

export function RunZip() {
  const { bridge, stores } = useApp();
  const runs = useStore(stores.runs, (s) => s.runs);
  const focusId = useStore(stores.runs, (s) => s.focusId);
  const refresh = useStore(stores.runs, (s) => s.refresh);
  const [picked, setPicked] = useState('');
  const [message, setMessage] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement | null>(null);
  const { api } = bridge;
  if (!api.exportRunZip || !api.importRunZip) return null;
  const id = picked || focusId || runs[0]?.id || '';
  const download = async () => {
    try {
      const zip = await api.exportRunZip?.(id);
      if (!zip) return;
      downloadBlob(zip.fileName, new Blob([zip.bytes as Uint8Array<ArrayBuffer>], { type: 'application/zip' }));
      setMessage(
        `Saved ${zip.fileName}: open it with the desktop app, or unzip it and run tunebench analyze on the folder.`,
      );
    } catch (error) {
      setMessage((error as Error).message);
    }
  };
  const load = async (file: File | undefined) => {
    if (!file) return;
    try {
      const added = (await api.importRunZip?.(file.name, new Uint8Array(await file.arrayBuffer()))) ?? [];
      setMessage(`Added ${added.map((run) => `${run.dut.id} (${run.kind})`).join(', ')} from ${file.name}.`);
      await refresh();
    } catch (error) {
      setMessage((error as Error).message);
    } finally {
      if (fileRef.current) fileRef.current.value = '';
    }
  };
  return (
    <div className="import-row" data-testid="run-zip">
      <div className="field">
        <label htmlFor="run-zip-pick">Run folder as a zip</label>
        <select id="run-zip-pick" value={id} onChange={(e) => setPicked(e.target.value)} data-testid="run-zip-pick">
          {runs.map((run) => (
            <option key={run.id} value={run.id}>
              {run.id}
            </option>
          ))}
        </select>
      </div>
      <button type="button" onClick={() => void download()} disabled={id === ''} data-testid="run-zip-export">
        Download as zip
      </button>
      <div className="field">
        <label htmlFor="run-zip-file">Add runs from a zip</label>
        <input
          id="run-zip-file"
          ref={fileRef}
          type="file"
          accept=".zip,application/zip"
          data-testid="run-zip-import"
          onChange={(e) => void load(e.target.files?.[0])}
        />
      </div>
      {message ? (
        <p className="muted" role="status" data-testid="run-zip-message">
          {message}
        </p>
      ) : null}
    </div>
  );
}
