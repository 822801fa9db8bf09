/**
 * Minimal flag parser: `--name value`, `--name=value`, boolean `--flag`,
 * and positionals. Unknown flags are a UsageError naming the flag.
 */
import { UsageError } from './types.ts';

export interface FlagSpec {
  /** Flags that take a value. */
  values?: readonly string[];
  /** Flags that stand alone (true when present). */
  booleans?: readonly string[];
  /** Flags that may repeat (collected into an array). */
  repeatable?: readonly string[];
  /** Short forms: `{ o: 'output' }` makes `-o FILE` mean `--output FILE`. */
  aliases?: Readonly<Record<string, string>>;
}

export interface ParsedFlags {
  values: Map<string, string>;
  lists: Map<string, string[]>;
  booleans: Set<string>;
  positionals: string[];
}

export function parseFlags(argv: readonly string[], spec: FlagSpec): ParsedFlags {
  const valueFlags = new Set(spec.values ?? []);
  const booleanFlags = new Set(spec.booleans ?? []);
  const repeatable = new Set(spec.repeatable ?? []);
  const parsed: ParsedFlags = { values: new Map(), lists: new Map(), booleans: new Set(), positionals: [] };
  for (let i = 0; i < argv.length; i++) {
    const raw = argv[i] as string;
    const alias = /^-([A-Za-z])$/.exec(raw)?.[1];
    const long = alias !== undefined ? spec.aliases?.[alias] : undefined;
    const arg = long !== undefined ? `--${long}` : raw;
    if (!arg.startsWith('--') || arg === '--') {
      parsed.positionals.push(arg);
      continue;
    }
    const eq = arg.indexOf('=');
    const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
    if (booleanFlags.has(name)) {
      if (eq >= 0) throw new UsageError(`--${name} takes no value`);
      parsed.booleans.add(name);
      continue;
    }
    if (!valueFlags.has(name) && !repeatable.has(name)) {
      throw new UsageError(`unknown option --${name}`);
    }
    let value: string | undefined;
    if (eq >= 0) value = arg.slice(eq + 1);
    else {
      value = argv[i + 1];
      i++;
    }
    if (value === undefined || (eq < 0 && value.startsWith('--'))) {
      throw new UsageError(`--${name} needs a value`);
    }
    if (repeatable.has(name)) {
      const list = parsed.lists.get(name) ?? [];
      list.push(value);
      parsed.lists.set(name, list);
    } else {
      parsed.values.set(name, value);
    }
  }
  return parsed;
}

/**
 * A flag value that must parse to a number > 0: undefined when the flag is
 * absent, else `parse(text)`; null, NaN or ≤ 0 is a UsageError
 * `--name: <refusal(text)>`.
 */
export function positiveFlag(name: string, text: string | undefined, parse: (text: string) => number | null, refusal: (text: string) => string): number | undefined {
  if (text === undefined) return undefined;
  const value = parse(text);
  if (value === null || !(value > 0)) throw new UsageError(`--${name}: ${refusal(text)}`);
  return value;
}
