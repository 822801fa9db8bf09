/**
 * Registry of sub-commands. Each contributor adds its command here.
 */
import type { CliCommand } from './types.ts';

export const commands: CliCommand[] = [];
