// Types of cli-bundle.mjs for the TypeScript that imports it.
export const PROJECT_ROOT: string;
export const BUNDLE_FILE: string;
export const INPUTS_FILE: string;
export function bundleStaleReason(): string | null;
export function loadBundle(): { exports: unknown; saveCache(): void };
export const START_FLAGS: string;
export const BIG_WORK_FLAGS: string;
export function useStartFlags(): void;
export function tuneForBigWork(): void;
