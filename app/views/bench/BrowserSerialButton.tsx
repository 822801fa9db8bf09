/**
 * Web edition only: "Serial port in this browser" opens the browser's port
 * chooser (Web Serial); a granted port joins the serial ports on offer as
 * `usb-VVVV-PPPP` (its USB ids). Shown only where the BenchApi has the verb (web/page-bench.ts).
 */
import { useState } from 'react';
import { useApp } from '../app-context.ts';

export function BrowserSerialButton({ disabled }: { disabled: boolean }) {
  const { bridge, stores } = useApp();
  const [message, setMessage] = useState<string | null>(null);
  const { api } = bridge;
  if (!api.chooseBrowserSerialPort) return null;
  const pick = async () => {
    try {
      const port = await api.chooseBrowserSerialPort?.();
      if (!port) return;
      await stores.connection.getState().refresh();
      setMessage(`Port ${port.path} granted: pick it as the serial port of a role below.`);
    } catch (error) {
      await stores.connection.getState().refresh();
      setMessage((error as Error).message);
    }
  };
  return (
    <>
      <button
        type="button"
        className="big"
        onClick={() => void pick()}
        disabled={disabled}
        data-testid="browser-serial"
      >
        Serial port in this browser…
      </button>
      {message ? (
        <p className="muted" role="status" data-testid="browser-serial-message">
          {message}
        </p>
      ) : null}
    </>
  );
}
