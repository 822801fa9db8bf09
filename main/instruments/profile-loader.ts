/**
 * Finds, reads, validates and compiles instrument profiles. A name is looked
 * up in the user's profile folder first (so a user can override a shipped
 * profile) and then among the shipped ones in resources/profiles/. A value
 * containing a path separator or ending in .json is read as a file path.
 */
import { parseBoundedJson } from '../../app/contract/bounded-json.ts';
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ProfileError } from './errors.ts';
import { defaultProfileName, parseProfile } from './profile-parse.ts';
import type {
  ChamberProfile,
  CounterProfile,
  InstrumentProfile,
  SupplyProfile,
  ThermometerProfile,
} from './profile-schema.ts';
import type { RoleName } from './roles.ts';

export { defaultProfileName, parseProfile };

export const SHIPPED_PROFILE_DIR = fileURLToPath(new URL('../../resources/profiles/', import.meta.url));

export interface LoadProfileOptions {
  /** The user's own profiles (searched first). */
  userDir?: string;
  /** Shipped profiles; default resources/profiles/. */
  shippedDir?: string;
  /** Refuse a profile written for another role. */
  role?: RoleName;
}

type ProfileFor<R extends RoleName> = R extends 'supply'
  ? SupplyProfile
  : R extends 'counter'
    ? CounterProfile
    : R extends 'chamber'
      ? ChamberProfile
      : ThermometerProfile;

const NAME_RE = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;

export async function loadProfile<R extends RoleName>(
  name: string,
  options: LoadProfileOptions & { role: R },
): Promise<ProfileFor<R>>;
export async function loadProfile(name: string, options?: LoadProfileOptions): Promise<InstrumentProfile>;
export async function loadProfile(name: string, options: LoadProfileOptions = {}): Promise<InstrumentProfile> {
  const candidates = candidatePaths(name, options);
  for (const file of candidates) {
    let text: string;
    try {
      text = await readFile(file, 'utf8');
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') continue;
      throw new ProfileError(name, `cannot read ${file}: ${(error as Error).message}`);
    }
    let json: unknown;
    try {
      json = parseBoundedJson(text);
    } catch (error) {
      throw new ProfileError(name, `${file}: ${(error as Error).message}`);
    }
    const profile = parseProfile(json, profileNameOf(name));
    if (options.role !== undefined && profile.role !== options.role) {
      throw new ProfileError(
        name,
        `role: is "${profile.role}", but this instrument is configured as the ${options.role}`,
      );
    }
    return profile;
  }
  throw new ProfileError(name, `not found; looked in ${candidates.join(', ')}`);
}

/** Profile names available: user profiles first, then shipped ones not overridden. */
export async function listProfiles(
  options: Omit<LoadProfileOptions, 'role'> = {},
): Promise<{ name: string; source: 'user' | 'shipped' }[]> {
  const found = new Map<string, 'user' | 'shipped'>();
  for (const [dir, source] of [
    [options.userDir, 'user'],
    [options.shippedDir ?? SHIPPED_PROFILE_DIR, 'shipped'],
  ] as const) {
    if (dir === undefined) continue;
    const entries = await readdir(dir).catch(() => [] as string[]);
    for (const entry of entries.sort()) {
      if (entry.endsWith('.json') && !found.has(entry.slice(0, -5))) found.set(entry.slice(0, -5), source);
    }
  }
  return [...found].map(([name, source]) => ({ name, source }));
}

function candidatePaths(name: string, options: LoadProfileOptions): string[] {
  if (name.includes('/') || name.includes('\\') || name.endsWith('.json')) return [path.resolve(name)];
  if (!NAME_RE.test(name))
    throw new ProfileError(name, 'name: use letters, digits, ".", "_" and "-" (or give a path to a .json file)');
  const dirs = [options.userDir, options.shippedDir ?? SHIPPED_PROFILE_DIR].filter((d): d is string => d !== undefined);
  return dirs.map((dir) => path.join(dir, `${name}.json`));
}

function profileNameOf(name: string): string {
  return name.endsWith('.json') ? path.basename(name, '.json') : name;
}
