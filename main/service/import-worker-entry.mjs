// Starts the import worker from the TypeScript sources (CLI, `serve` and
// tests run them through tsx; a worker thread does not inherit the main
// thread's loader, so it registers its own). The desktop bundle has its own
// compiled import-worker.js instead.
import { register } from 'tsx/esm/api';

register();
await import('./import-worker.ts');
