import { describe, expect, it } from 'vitest';
import { parseDurationS } from '../../app/contract/si.ts';
import { parseFlags, positiveFlag, withFlags } from './flags.ts';
import { UsageError } from './types.ts';

describe('positiveFlag', () => {
  const refusal = (text: string): string => `expected a duration, got "${text}"`;
  it('is undefined when the flag is absent', () => {
    expect(positiveFlag('duration', undefined, parseDurationS, refusal)).toBeUndefined();
  });
  it('returns the parsed value', () => {
    expect(positiveFlag('duration', '15min', parseDurationS, refusal)).toBe(900);
  });
  it.each(['soon', '0s', '-5s'])('refuses "%s" with a UsageError naming the flag', (text) => {
    expect(() => positiveFlag('duration', text, parseDurationS, refusal)).toThrow(UsageError);
    expect(() => positiveFlag('duration', text, parseDurationS, refusal)).toThrow(
      `--duration: expected a duration, got "${text}"`,
    );
  });
});

describe('parseFlags (util.parseArgs)', () => {
  const spec = { values: ['output', 'fit'], booleans: ['json'], repeatable: ['window'], aliases: { o: 'output' } };

  it('reads values, booleans, aliases, repeats and positionals; after -- everything is positional', () => {
    const flags = parseFlags(
      ['run1', '-o', 'out.md', '--fit=poly:2', '--json', '--window', '1..2', '--window', '3..4', '--', '--json', '-o'],
      spec,
    );
    expect(flags.values.get('output')).toBe('out.md');
    expect(flags.values.get('fit')).toBe('poly:2');
    expect(flags.booleans.has('json')).toBe(true);
    expect(flags.lists.get('window')).toEqual(['1..2', '3..4']);
    expect(flags.positionals).toEqual(['run1', '--json', '-o']);
  });

  it('a value that starts with a dash is given with =', () => {
    expect(parseFlags(['--fit=-1'], spec).values.get('fit')).toBe('-1');
  });

  it('refuses a value on a boolean flag and names unknown flags with the nearest known one', () => {
    expect(() => parseFlags(['--json=yes'], spec)).toThrow('--json takes no value');
    expect(() => parseFlags(['--jsno'], spec)).toThrow('unknown option --jsno (did you mean --json?)');
    expect(() => parseFlags(['-x'], spec)).toThrow('unknown option -x');
  });

  it('withFlags extends a shared spec', () => {
    const flags = parseFlags(
      ['--bench', 'b.json', '--window', 'w'],
      withFlags({ values: ['bench'] }, { repeatable: ['window'] }),
    );
    expect(flags.values.get('bench')).toBe('b.json');
    expect(flags.lists.get('window')).toEqual(['w']);
  });
});
