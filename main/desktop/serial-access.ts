/**
 * Puts the decisions of serial-grants.ts onto an Electron session: the three
 * permission handlers (check, request, device) and the `select-serial-port`
 * chooser event, which is the one way a port is granted — the user picks it
 * in a main-process chooser. Typed against the few session members it uses
 * (no Electron import), so a test can hand it a fake session.
 */
import {
  allowDevice,
  allowPermissionCheck,
  allowPermissionRequest,
  offerablePorts,
  SerialGrants,
  type OriginTest,
  type SerialPortDescription,
} from './serial-grants.ts';

/** The web contents a chooser event comes from, as far as deciding goes. */
export interface ChooserContents {
  getURL(): string;
}

/** The members of Electron's `Session` this module calls. */
export interface PermissionSession<C extends ChooserContents> {
  setPermissionCheckHandler(
    handler: (
      contents: unknown,
      permission: string,
      requestingOrigin: string,
      details: { securityOrigin?: string; embeddingOrigin?: string },
    ) => boolean,
  ): void;
  setPermissionRequestHandler(
    handler: (contents: unknown, permission: string, callback: (granted: boolean) => void) => void,
  ): void;
  setDevicePermissionHandler(
    handler: (details: { deviceType: string; origin: string; device: unknown }) => boolean,
  ): void;
  on(
    event: 'select-serial-port',
    listener: (
      event: { preventDefault(): void },
      portList: unknown[],
      contents: C,
      callback: (portId: string) => void,
    ) => void,
  ): unknown;
}

export interface SerialAccessOptions<C extends ChooserContents> {
  /** The app's own origin (or the dev server's). */
  isAppOrigin: OriginTest;
  /** The app's own page URL (a chooser is shown only to it). */
  isOwnPage: (url: string) => boolean;
  /** Asks the user which port (a main-process dialog); null when they decline. */
  choosePort: (ports: SerialPortDescription[], contents: C) => Promise<SerialPortDescription | null>;
  /** Where a chooser failure is reported. */
  log?: (line: string) => void;
}

/** Installs every handler; returns the grants (what the user chose so far). */
export function installSerialAccess<C extends ChooserContents>(
  session: PermissionSession<C>,
  options: SerialAccessOptions<C>,
): SerialGrants {
  const grants = new SerialGrants();
  const { isAppOrigin } = options;
  session.setPermissionCheckHandler((_contents, permission, requestingOrigin, details) =>
    allowPermissionCheck(
      {
        permission,
        requestingOrigin,
        securityOrigin: details.securityOrigin,
        embeddingOrigin: details.embeddingOrigin,
      },
      isAppOrigin,
    ),
  );
  session.setPermissionRequestHandler((_contents, permission, callback) =>
    callback(allowPermissionRequest(permission)),
  );
  session.setDevicePermissionHandler((details) => allowDevice(details, grants, isAppOrigin));
  session.on('select-serial-port', (event, portList, contents, callback) => {
    // Without preventDefault Electron cancels the request itself; with it, the answer is ours.
    event.preventDefault();
    const ports = offerablePorts(portList);
    if (!options.isOwnPage(contents.getURL()) || ports.length === 0) {
      callback('');
      return;
    }
    options.choosePort(ports, contents).then(
      (chosen) => {
        const port = chosen === null ? undefined : ports.find((p) => p.portId === chosen.portId);
        if (port === undefined) {
          callback('');
          return;
        }
        grants.grant(port);
        callback(port.portId);
      },
      (error: unknown) => {
        options.log?.(
          `tunebench: serial port chooser failed: ${error instanceof Error ? error.message : String(error)}`,
        );
        callback('');
      },
    );
  });
  return grants;
}
