/**
 * The page's stand-ins for the four Node-facing modules the shared code
 * reaches (the same idea as package.json's "browser" field): the web build
 * (app/web/vite.config.ts) resolves each original to its stand-in, and
 * test/architecture/node-free.test.ts follows the same map when it proves
 * the page's import graph holds no Node built-in. Each stand-in exports what
 * the page's modules import from the original, typed against it.
 */
export const PAGE_MODULES: Readonly<Record<string, string>> = {
  // TCP and serialport transports → the simulated bench and the browser's own serial ports.
  'main/instruments/create-transport.ts': 'app/web/page/create-transport.ts',
  // Profile files on disk → the shipped profiles bundled into the page.
  'main/instruments/profile-loader.ts': 'app/web/page/profile-loader.ts',
  // Host names resolved by DNS → the page reaches only the simulated bench and ports the user granted.
  'main/service/address-policy.ts': 'app/web/page/address-policy.ts',
  // Run folders on disk → run folders in the Origin Private File System.
  'main/store/index.ts': 'app/web/page/store-index.ts',
};
