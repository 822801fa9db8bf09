/**
 * Paths on the store's file system (the machine's own: node:path). Code
 * above the store builds folder and file paths through here, so procedures
 * import no Node built-in themselves (the web edition's page has its own
 * store and never loads this module).
 */
export { join as joinPath, resolve as resolvePath } from 'node:path';
