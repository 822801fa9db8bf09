/**
 * Command-line flags through Node's util.parseArgs: `--name value`,
 * `--name=value`, boolean `--flag`, short aliases, repeatable flags and
 * positionals; everything after `--` is a positional, even if it starts
 * with a dash. Each command declares its flags in one FlagSpec, so adding a
 * flag is one word in one list. Unknown flags are a UsageError naming the
 * flag and the nearest known one.
 */
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { nearestKey } from '../../app/contract/nearest-key.ts';
import { UsageError } from './types.ts';

export interface FlagSpec {
  /** Flags that take a value. */
  values?: readonly string[];
  /** Flags that stand alone (true when present). */
  booleans?: readonly string[];
  /** Flags that take a value and may repeat (collected into a list). */
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

/** A FlagSpec with more flags: how a command extends the flags it shares with others. */
export function withFlags(spec: FlagSpec, more: FlagSpec): FlagSpec {
  return {
    values: [...(spec.values ?? []), ...(more.values ?? [])],
    booleans: [...(spec.booleans ?? []), ...(more.booleans ?? [])],
    repeatable: [...(spec.repeatable ?? []), ...(more.repeatable ?? [])],
    aliases: { ...spec.aliases, ...more.aliases },
  };
}

function optionsOf(spec: FlagSpec): NonNullable<ParseArgsConfig['options']> {
  const options: NonNullable<ParseArgsConfig['options']> = {};
  const shortOf = new Map(Object.entries(spec.aliases ?? {}).map(([short, long]) => [long, short]));
  const add = (name: string, type: 'string' | 'boolean', multiple: boolean): void => {
    const short = shortOf.get(name);
    options[name] = { type, multiple, ...(short === undefined ? {} : { short }) };
  };
  for (const name of spec.values ?? []) add(name, 'string', false);
  for (const name of spec.repeatable ?? []) add(name, 'string', true);
  for (const name of spec.booleans ?? []) add(name, 'boolean', false);
  return options;
}

/** parseArgs' own errors, reworded to name the flag as the rest of the CLI does. */
function usageErrorOf(error: unknown, spec: FlagSpec, argv: readonly string[]): UsageError {
  const code = (error as NodeJS.ErrnoException).code;
  const message = error instanceof Error ? error.message : String(error);
  const flag = /'(-{1,2}[^' =]+)/.exec(message)?.[1] ?? '';
  if (code === 'ERR_PARSE_ARGS_UNKNOWN_OPTION') {
    const known = [...(spec.values ?? []), ...(spec.booleans ?? []), ...(spec.repeatable ?? [])];
    const near = nearestKey(flag.replace(/^-+/, ''), known);
    return new UsageError(`unknown option ${flag}${near === null ? '' : ` (did you mean --${near}?)`}`);
  }
  if (code === 'ERR_PARSE_ARGS_INVALID_OPTION_VALUE') {
    const name = /--([^\s'=<]+)/.exec(message)?.[1] ?? flag.replace(/^-+/, '');
    if ((spec.booleans ?? []).includes(name)) return new UsageError(`--${name} takes no value`);
    const i = argv.findIndex((arg) => arg === `--${name}`);
    const next = i >= 0 ? argv[i + 1] : undefined;
    return new UsageError(
      `--${name} needs a value${next === undefined ? '' : ` (got the option "${next}"; write --${name}=${next} if that is the value)`}`,
    );
  }
  return new UsageError(message);
}

export function parseFlags(argv: readonly string[], spec: FlagSpec): ParsedFlags {
  let parsed: ReturnType<typeof parseArgs>;
  try {
    parsed = parseArgs({ args: [...argv], options: optionsOf(spec), strict: true, allowPositionals: true });
  } catch (error) {
    throw usageErrorOf(error, spec, argv);
  }
  const result: ParsedFlags = {
    values: new Map(),
    lists: new Map(),
    booleans: new Set(),
    positionals: [...parsed.positionals],
  };
  for (const [name, value] of Object.entries(parsed.values)) {
    if (value === undefined) continue;
    if (Array.isArray(value)) result.lists.set(name, value.map(String));
    else if (typeof value === 'boolean') {
      if (value) result.booleans.add(name);
    } else result.values.set(name, value);
  }
  return result;
}

/** The arguments before a `--`, where `--help` still means help. */
export function argsBeforeSeparator(argv: readonly string[]): readonly string[] {
  const end = argv.indexOf('--');
  return end < 0 ? argv : argv.slice(0, end);
}

/**
 * A flag value that must parse to a number > 0: undefined when the flag is
 * absent, else `parse(text)`; null, NaN or ≤ 0 is a UsageError
 * `--name: <refusal(text)>`.
 */
export function positiveFlag(
  name: string,
  text: string | undefined,
  parse: (text: string) => number | null,
  refusal: (text: string) => string,
): number | undefined {
  if (text === undefined) return undefined;
  const value = parse(text);
  if (value === null || !(value > 0)) throw new UsageError(`--${name}: ${refusal(text)}`);
  return value;
}
