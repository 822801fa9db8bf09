/**
 * Browser mode: one HTTP server on loopback that serves the built renderer
 * and carries the BenchApi over a WebSocket at /api.
 *
 * Access (see DEVELOPERS.md, "Browser mode"):
 * - The printed URL carries a random token. The page request must bear it
 *   (`/?token=…`); that answer also sets an HttpOnly, SameSite=Strict cookie
 *   so the page's own scripts and styles load without it. The cookie holds a
 *   second, unrelated secret that only opens static files: browsers send
 *   cookies to every port of a host, so the cookie must never be worth the
 *   token.
 * - The WebSocket needs the token in its URL (no cookie counts) AND an Origin
 *   equal to this server's own origin; others are refused at the handshake.
 * - The Host header must name this server (guards against DNS rebinding),
 *   also when listening on every interface: then it must name one of this
 *   machine's own addresses or its host name.
 * - At most MAX_CLIENTS pages at once; each is told how many others are on
 *   the same bench (one bench, one operator: any of them can stop a run).
 * All comparisons of secrets are constant-time.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo, Socket } from 'node:net';
import { hostname, networkInterfaces } from 'node:os';
import type { WebSocket } from 'ws';
import type { BenchApi } from '../../app/contract/bench-api.ts';
import { MAX_WIRE_MESSAGE_BYTES } from '../../app/contract/wire.ts';
import { securityHeaders } from './security-headers.ts';
import { readStaticFile } from './static-files.ts';
import { createAccessToken, readCookie, TOKEN_COOKIE, tokenMatches } from './token.ts';
import type { OpenImport } from './import-upload.ts';
import { attachBenchSocket } from './ws-api.ts';

export interface BrowserServerOptions {
  host: string;
  port: number;
  rendererDir: string;
  api: BenchApi;
  /** Streamed CSV imports (the service's openImport); without it, import parts are refused. */
  openImport?: OpenImport;
  /** How long a reply waits for a page that does not read (tests shorten it). */
  drainWaitMs?: number;
  /** Fixed token for tests; a fresh random one otherwise. */
  token?: string;
  /** Where an internal error behind a 500 answer is reported; default stderr. */
  logError?: (message: string) => void;
}

export interface BrowserServer {
  /** http://host:port/?token=… — the URL to open. */
  url: string;
  origin: string;
  port: number;
  token: string;
  close(): Promise<void>;
}

/** Pages connected at once; more are refused at the handshake (503). */
export const MAX_CLIENTS = 8;

function isLoopbackName(host: string): boolean {
  return host === '127.0.0.1' || host === 'localhost' || host === '::1' || host === '[::1]';
}

function hostPort(host: string, port: number): string {
  return host.includes(':') && !host.startsWith('[') ? `[${host}]:${port}` : `${host}:${port}`;
}

/** This machine's interface addresses and host name: what a Host header may name when listening on every interface. */
function ownHostNames(): string[] {
  const names = [hostname().toLowerCase()];
  for (const entries of Object.values(networkInterfaces()))
    for (const entry of entries ?? []) names.push(entry.address.toLowerCase());
  return names;
}

/**
 * The Host headers this server answers to (DNS-rebinding guard): its own
 * address, loopback names when on loopback, and — when listening on every
 * interface — this machine's own addresses and name, never another domain.
 */
export function allowedHostHeaders(listenHost: string, port: number, ownNames: readonly string[]): Set<string> {
  const wildcard = listenHost === '0.0.0.0' || listenHost === '::';
  const allowed = new Set([hostPort(listenHost, port)]);
  if (isLoopbackName(listenHost) || wildcard)
    for (const name of ['127.0.0.1', 'localhost', '[::1]']) allowed.add(`${name}:${port}`);
  if (wildcard) for (const name of ownNames) allowed.add(hostPort(name.toLowerCase(), port));
  return allowed;
}

/** Tells each connected page how many other pages drive the same bench. */
function tellPeers(clients: Set<WebSocket>): void {
  const open = [...clients].filter((client) => client.readyState === client.OPEN);
  for (const client of open) client.send(JSON.stringify({ event: { type: 'peers', others: open.length - 1 } }));
}

export async function startBrowserServer(options: BrowserServerOptions): Promise<BrowserServer> {
  const token = options.token ?? createAccessToken();
  const http = createServer();
  // Loaded here, not at the top: every CLI start would pay for it otherwise.
  const { WebSocketServer } = await import('ws');
  const wss = new WebSocketServer({ noServer: true, maxPayload: MAX_WIRE_MESSAGE_BYTES });
  const assetSecret = createAccessToken();
  await new Promise<void>((resolve, reject) => {
    http.once('error', reject);
    http.listen(options.port, options.host, () => {
      http.off('error', reject);
      resolve();
    });
  });
  const port = (http.address() as AddressInfo).port;
  const cookieName = `${TOKEN_COOKIE}_${port}`; // cookies ignore ports; one name per server
  const allowedHosts = allowedHostHeaders(options.host, port, ownHostNames());
  const origin = `http://${hostPort(options.host, port)}`;

  const hostAllowed = (request: IncomingMessage): boolean => {
    const host = request.headers.host;
    return typeof host === 'string' && allowedHosts.has(host.toLowerCase());
  };
  const originAllowed = (request: IncomingMessage): boolean => {
    const offered = request.headers.origin;
    return typeof offered === 'string' && offered === `http://${request.headers.host ?? ''}` && hostAllowed(request);
  };
  const tokenOf = (request: IncomingMessage): { query: boolean; cookie: boolean } => {
    const url = new URL(request.url ?? '/', 'http://placeholder');
    return {
      query: tokenMatches(token, url.searchParams.get('token')),
      cookie: tokenMatches(assetSecret, readCookie(request.headers.cookie, cookieName)),
    };
  };

  const refuse = (response: ServerResponse, status: number, text: string): void => {
    response.writeHead(status, { ...securityHeaders(origin), 'Content-Type': 'text/plain; charset=utf-8' });
    response.end(`${text}\n`);
  };

  http.on('request', (request: IncomingMessage, response: ServerResponse) => {
    void (async () => {
      if (!hostAllowed(request)) return refuse(response, 421, 'This server answers only to its own address.');
      if (request.method !== 'GET' && request.method !== 'HEAD') return refuse(response, 405, 'Only GET is served.');
      const access = tokenOf(request);
      if (!access.query && !access.cookie) {
        return refuse(
          response,
          401,
          'Access token missing or wrong: open the URL that `tunebench serve` printed (it ends in ?token=…).',
        );
      }
      const pathname = new URL(request.url ?? '/', 'http://placeholder').pathname;
      const file = await readStaticFile(options.rendererDir, pathname);
      // Browsers ask for an icon unprompted; no icon is not an error.
      if (!file && pathname === '/favicon.ico') return void response.writeHead(204, securityHeaders(origin)).end();
      if (!file) return refuse(response, 404, 'Not found.');
      const headers: Record<string, string> = { ...securityHeaders(origin), 'Content-Type': file.contentType };
      if (access.query) headers['Set-Cookie'] = `${cookieName}=${assetSecret}; HttpOnly; SameSite=Strict; Path=/`;
      response.writeHead(200, headers);
      response.end(request.method === 'HEAD' ? undefined : file.body);
    })().catch((error: unknown) => {
      (options.logError ?? console.error)(
        `tunebench serve: ${request.method ?? '?'} ${request.url ?? '?'} failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`,
      );
      if (!response.headersSent) refuse(response, 500, 'Internal error.');
      else response.destroy();
    });
  });

  http.on('upgrade', (request: IncomingMessage, socket: Socket, head: Buffer) => {
    const pathname = new URL(request.url ?? '/', 'http://placeholder').pathname;
    const reject = (status: string): void => {
      socket.end(`HTTP/1.1 ${status}\r\nConnection: close\r\nContent-Length: 0\r\n\r\n`);
    };
    if (pathname !== '/api') return reject('404 Not Found');
    if (!hostAllowed(request) || !originAllowed(request)) return reject('403 Forbidden');
    // The socket takes the token from its URL only: the cookie opens the
    // page's static assets, and is never enough to drive the bench.
    if (!tokenOf(request).query) return reject('401 Unauthorized');
    if (wss.clients.size >= MAX_CLIENTS) return reject('503 Service Unavailable');
    wss.handleUpgrade(request, socket, head, (ws) => {
      attachBenchSocket(ws, options.api, { openImport: options.openImport, drainWaitMs: options.drainWaitMs });
      ws.on('close', () => tellPeers(wss.clients));
      tellPeers(wss.clients);
    });
  });

  return {
    url: `${origin}/?token=${token}`,
    origin,
    port,
    token,
    close: async () => {
      for (const client of wss.clients) client.terminate();
      wss.close();
      http.closeAllConnections();
      await new Promise<void>((resolve) => http.close(() => resolve()));
    },
  };
}
