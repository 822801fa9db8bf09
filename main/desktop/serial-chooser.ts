/**
 * The main-process chooser a Web Serial port request opens: one button per
 * port, and Cancel (the default). As plain data, so a test reads it without
 * Electron; main/index.ts shows it with `dialog.showMessageBox`.
 */
import type { SerialPortDescription } from './serial-grants.ts';

export interface SerialChooserDialog {
  type: 'question';
  title: string;
  message: string;
  detail: string;
  buttons: string[];
  defaultId: number;
  cancelId: number;
  /** Windows: plain buttons, not command links. */
  noLink: true;
}

/** One line per port: the OS name first (what the user sees in their device list), then what identifies it. */
export function portLabel(port: SerialPortDescription): string {
  const parts = [port.portName];
  if (port.displayName !== undefined && port.displayName !== '' && port.displayName !== port.portName)
    parts.push(port.displayName);
  if (port.vendorId !== undefined && port.productId !== undefined)
    parts.push(`vendor ${port.vendorId}, product ${port.productId}`);
  if (port.serialNumber !== undefined && port.serialNumber !== '') parts.push(`serial number ${port.serialNumber}`);
  return parts.join(' — ');
}

export function serialChooserDialog(ports: readonly SerialPortDescription[]): {
  options: SerialChooserDialog;
  /** The port behind the button the user pressed; null for Cancel or anything else. */
  portAt: (response: number) => SerialPortDescription | null;
} {
  const cancelId = ports.length;
  return {
    options: {
      type: 'question',
      title: 'Serial port',
      message: 'Which serial port may tunebench open?',
      detail:
        'Only the port you choose becomes available to the app, until it quits. Choose the port of the instrument you mean to drive.',
      buttons: [...ports.map(portLabel), 'Cancel'],
      defaultId: cancelId,
      cancelId,
      noLink: true,
    },
    portAt: (response) =>
      Number.isInteger(response) && response >= 0 && response < cancelId ? (ports[response] ?? null) : null,
  };
}
