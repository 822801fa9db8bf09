import { describe, expect, it } from 'vitest';
import { parseDurationS } from '../../app/contract/si.ts';
import { positiveFlag } from './flags.ts';
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
    expect(() => positiveFlag('duration', text, parseDurationS, refusal)).toThrow(`--duration: expected a duration, got "${text}"`);
  });
});
