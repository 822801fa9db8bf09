/**
 * Serves the built renderer (out/renderer) read-only. A request path is
 * decoded, normalised and must stay inside the root; anything else is 404.
 * Symbolic links are followed only when the file they lead to is still
 * inside the (real) root.
 */
import { readFile, realpath, stat } from 'node:fs/promises';
import { extname, join, normalize, sep } from 'node:path';

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.txt': 'text/plain; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
};

export interface StaticFile {
  body: Buffer;
  contentType: string;
}

/** Resolves a URL path to a file under `root`, or null (missing or outside). */
export function resolveStaticPath(root: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return null;
  const relative = normalize(decoded === '/' ? '/index.html' : decoded).replace(/^[/\\]+/, '');
  if (relative.split(/[/\\]/).some((part) => part === '..' || part.startsWith('.'))) return null;
  const full = join(root, relative);
  const rootWithSep = root.endsWith(sep) ? root : root + sep;
  return full.startsWith(rootWithSep) ? full : null;
}

export async function readStaticFile(root: string, urlPath: string): Promise<StaticFile | null> {
  const path = resolveStaticPath(root, urlPath);
  if (path === null) return null;
  try {
    const [realRoot, realFile] = await Promise.all([realpath(root), realpath(path)]);
    const rootWithSep = realRoot.endsWith(sep) ? realRoot : realRoot + sep;
    if (!realFile.startsWith(rootWithSep)) return null;
    const info = await stat(realFile);
    if (!info.isFile()) return null;
    return {
      body: await readFile(realFile),
      contentType: CONTENT_TYPES[extname(path).toLowerCase()] ?? 'application/octet-stream',
    };
  } catch (error) {
    // Missing is a 404; any other failure (ELOOP, EIO, EMFILE) is the server's own and must be seen.
    const code = (error as { code?: unknown }).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') return null;
    throw error;
  }
}
