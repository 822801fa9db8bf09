/**
 * Command strings with placeholders, e.g. `INST:NSEL {channel};:SOUR:VOLT {volts}`.
 * Compiled once when a profile loads (no parsing on the hot path); `{{` and
 * `}}` stand for literal braces.
 */

export interface CommandTemplate {
  readonly source: string;
  /** Placeholder names in order of appearance. */
  readonly placeholders: readonly string[];
  render(values: Readonly<Record<string, string>>): string;
}

/**
 * Compiles `source`, allowing only `allowed` placeholder names. Throws an
 * Error whose message names the bad placeholder and lists the allowed ones.
 */
export function compileTemplate(source: string, allowed: readonly string[]): CommandTemplate {
  const literals: string[] = [];
  const names: string[] = [];
  let literal = '';
  for (let i = 0; i < source.length; i += 1) {
    const ch = source[i];
    if (ch === '{' && source[i + 1] === '{') {
      literal += '{';
      i += 1;
    } else if (ch === '}' && source[i + 1] === '}') {
      literal += '}';
      i += 1;
    } else if (ch === '{') {
      const close = source.indexOf('}', i + 1);
      if (close === -1) throw new Error(`unclosed "{" at character ${i + 1}`);
      const name = source.slice(i + 1, close).trim();
      if (!allowed.includes(name)) {
        throw new Error(
          `unknown placeholder {${name}}; allowed here: ${allowed.length === 0 ? 'none' : allowed.map((a) => `{${a}}`).join(', ')}`,
        );
      }
      literals.push(literal);
      names.push(name);
      literal = '';
      i = close;
    } else if (ch === '}') {
      throw new Error(`stray "}" at character ${i + 1} (write }} for a literal brace)`);
    } else {
      literal += ch;
    }
  }
  literals.push(literal);
  if (names.length === 0) {
    const fixed = literals[0] ?? '';
    return { source, placeholders: names, render: () => fixed };
  }
  return {
    source,
    placeholders: names,
    render(values) {
      let out = literals[0] ?? '';
      for (let k = 0; k < names.length; k += 1) {
        const value = values[names[k] ?? ''];
        if (value === undefined) throw new TypeError(`no value for {${names[k]}} in "${source}"`);
        out += value + (literals[k + 1] ?? '');
      }
      return out;
    },
  };
}
