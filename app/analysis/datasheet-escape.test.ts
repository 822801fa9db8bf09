import { describe, expect, it } from 'vitest';
import type { Datasheet } from './datasheet.ts';
import { renderDatasheetHtml, renderDatasheetMarkdown } from './datasheet-render.ts';

// A sheet whose every text field carries markup (issue 14.6: the Markdown export wrote them raw).
const hostile: Datasheet = {
  title: '<script>alert(1)</script> *bold* [x](javascript:alert(2))',
  runs: [{ label: '<img src=x onerror=alert(3)>', kind: 'sweep' }],
  rows: [
    {
      key: 'kvco',
      parameter: 'Kvco <b>',
      conditions: 'Vdd = 3.3 V | `rm`',
      min: 1,
      typ: 2,
      max: 3,
      unit: 'Hz/V',
      scaling: 'si',
      runs: 1,
    },
  ],
  notes: ['line one\n# injected heading', '<iframe>'],
} as unknown as Datasheet;

describe('exports escape every text field (issue 14.6)', () => {
  it('Markdown: no raw HTML tag, no live link or emphasis, no injected line', () => {
    const md = renderDatasheetMarkdown(hostile);
    expect(md).not.toMatch(/<(script|img|iframe|b)\b/i);
    expect(md).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(md).toContain('\\*bold\\*');
    expect(md).toContain('\\[x\\](javascript:alert(2))');
    expect(md).toContain('&lt;img src=x onerror=alert(3)&gt;');
    expect(md).toContain('Vdd = 3.3 V \\| \\`rm\\`');
    expect(md.split('\n').filter((line) => line.startsWith('#'))).toEqual([
      '# &lt;script&gt;alert(1)&lt;/script&gt; \\*bold\\* \\[x\\](javascript:alert(2))',
    ]);
  });

  it('HTML: the same fields as text', () => {
    const page = renderDatasheetHtml(hostile);
    expect(page).not.toMatch(/<(script|img|iframe)\b/i);
    expect(page).toContain('&lt;img src=x onerror=alert(3)&gt;');
  });
});
