import { describe, expect, it } from 'vitest';
import type { Datasheet } from '../../analysis/datasheet.ts';
import { datasheetCsv, datasheetHtml, datasheetMarkdown, showRow } from './datasheet-files.ts';

const sheet: Datasheet = {
  title: 'Gain table <400 MHz varactor VCO>',
  runs: [{ label: 'vco-a · r1', kind: 'sweep' }],
  rows: [
    { key: 'kvcoLine', parameter: 'Kvco, best straight line', conditions: 'T 24.0 °C, gate 100 ms', min: 11.9e6, typ: 12.4e6, max: 13.05e6, unit: 'Hz/V', scaling: 'si', runs: 3 },
    { key: 'linearity', parameter: 'Linearity error (worst, of span)', conditions: '0.5 V … 4.5 V', min: null, typ: 2.5, max: null, unit: '%', scaling: 'plain', runs: 1 },
  ],
  notes: ['typ is the median'],
};

describe('datasheet files', () => {
  it('shows min/typ/max of a row in one prefixed unit', () => {
    expect(showRow(sheet.rows[0]!)).toEqual({ parameter: 'Kvco, best straight line', conditions: 'T 24.0 °C, gate 100 ms', min: '11.90', typ: '12.40', max: '13.05', unit: 'MHz/V' });
    expect(showRow(sheet.rows[1]!).min).toBe('');
  });

  it('writes CSV in SI base units, quoting where needed', () => {
    const lines = datasheetCsv(sheet).trimEnd().split('\r\n');
    expect(lines[0]).toBe('parameter,conditions,min,typ,max,unit,runs');
    expect(lines[1]).toBe('"Kvco, best straight line","T 24.0 °C, gate 100 ms",11900000,12400000,13050000,Hz/V,3');
    expect(lines[2]).toBe('"Linearity error (worst, of span)",0.5 V … 4.5 V,,2.5,,%,1');
  });

  it('writes a Markdown table and an escaped HTML page', () => {
    const md = datasheetMarkdown(sheet);
    expect(md).toContain('| Kvco, best straight line | T 24.0 °C, gate 100 ms | 11.90 | 12.40 | 13.05 | MHz/V |');
    const html = datasheetHtml(sheet);
    expect(html).toContain('<title>Gain table &lt;400 MHz varactor VCO&gt;</title>');
    expect(html).toContain('<td class="n">12.40</td>');
  });
});
