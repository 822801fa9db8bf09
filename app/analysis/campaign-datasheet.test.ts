/**
 * The campaign datasheet's three renderings from one analysis of synthetic
 * sweeps with known coefficients: f(V, T, S) = (1 kHz + 5 kHz/V·V)·(1 + 100
 * ppm/°C·(T − 25 °C)) + 200 Hz/V·(S − 5 V), plus a small deterministic ripple
 * so every fit has residuals. The tempcos must read 100 ppm/°C and the
 * pushing 200 Hz/V (the model's own values, by construction); every figure
 * carries its ±; user text (unit ids, title) stays text in HTML and Markdown.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCampaign, type CampaignConditionInput } from './campaign-analysis.ts';
import { renderCampaignCsv, renderCampaignHtml, renderCampaignMarkdown } from './campaign-datasheet.ts';
import type { SweepPointLite } from './campaign-local.ts';

const TEMPS = [-20, 25, 70];
const SUPPLIES = [4.75, 5, 5.25];
const UNITS = ['unit <b>1</b>', 'unit-2'];

function points(t: number, s: number, unitIndex: number): SweepPointLite[] {
  const out: SweepPointLite[] = [];
  for (let i = 0; i <= 30; i++) {
    const v = 1 + i * 0.1;
    const ripple = 0.02 * Math.sin(i * 1.7 + unitIndex + t / 10 + s);
    const f = (1000 + 5000 * v) * (1 + 100e-6 * (t - 25)) + 200 * (s - 5) + ripple;
    out.push({ v, meanHz: f, readings: 3, noOscillation: 0 });
  }
  return out;
}

function inputs(simulated: boolean): CampaignConditionInput[] {
  const list: CampaignConditionInput[] = [];
  UNITS.forEach((unit, u) => {
    for (const t of TEMPS)
      for (const s of SUPPLIES)
        list.push({
          index: list.length,
          unit,
          temperatureC: t,
          dutTemperatureC: t,
          supplyV: s,
          runId: `run-${list.length}`,
          status: 'done',
          points: points(t, s, u),
          stallV: 1.2,
          stallUncertaintyV: 0.05,
          simulated: simulated && list.length === 0,
        });
  });
  return list;
}

const options = { nominalControlV: 2.5, nominalSupplyV: 5, tuningWindowV: [1, 4] as [number, number] };

describe('campaign datasheet', () => {
  const analysis = analyzeCampaign(inputs(true), options);

  it('reads the model back: tempcos 100 ppm/°C, pushing 200 Hz/V', () => {
    expect(analysis.frequencyTempcoPpmPerC).toBeCloseTo(100, 0);
    expect(analysis.kvcoTempcoPpmPerC).toBeCloseTo(100, 0);
    expect(analysis.pushingHzPerV?.typ).toBeCloseTo(200, 0);
    expect(analysis.pushingHzPerV?.typUncertainty).toBeGreaterThan(0);
    expect(analysis.simulated).toBe(true);
  });

  it('HTML: one escaped page with the simulated banner, ± on every figure, per-temperature rows and headroom', () => {
    const page = renderCampaignHtml(analysis, 'Over <temperature> & supply');
    expect(page).toMatch(/^<!doctype html>/);
    expect(page).toContain('<title>Over &lt;temperature&gt; &amp; supply</title>');
    expect(page).not.toContain('<temperature>');
    expect(page).toContain('SIMULATED BENCH');
    expect(page).toContain('unit &lt;b&gt;1&lt;/b&gt;');
    expect(page).not.toContain('<b>1</b>');
    // The conditions column states the temperature and supply ranges.
    expect(page).toContain('T −20.0 °C … 70.0 °C; supply 4.750 V … 5.250 V; 2 units');
    for (const t of ['−20.0 °C', '25.0 °C', '70.0 °C']) {
      expect(page).toContain(`<td>Kvco at ${t}</td>`);
      expect(page).toContain(`<td>Frequency at ${t}</td>`);
    }
    const rows = [...page.matchAll(/<tr><td>([^<]+)<\/td><td>[^<]*<\/td>((?:<td class="num">[^<]*<\/td>){3})<\/tr>/g)];
    expect(rows.length).toBe(5 + 2 * TEMPS.length);
    for (const [, parameter, cells] of rows) {
      const figures = [...(cells as string).matchAll(/<td class="num">([^<]*)<\/td>/g)].map((m) => m[1]);
      for (const f of figures) expect(f, parameter).toMatch(/ ± /);
    }
    expect(page).toMatch(/<td>Frequency tempco<\/td><td>[^<]*<\/td><td class="num">\d+\.\d+ ± \d/);
    expect(page).toMatch(/<td>Supply pushing<\/td>/);
    // Headroom: one row per unit and temperature, control voltage with its ±, stall edge with its ±.
    expect(page).toMatch(/Tuning headroom over temperature/);
    expect([...page.matchAll(/<td>unit-2<\/td>/g)]).toHaveLength(TEMPS.length);
    expect(page).toMatch(/<td class="num">1\.20 ± 0\.05 V<\/td>|<td class="num">1\.200 ± 0\.050 V<\/td>/);
  });

  it('with two temperatures the tempco still carries its ±, propagated from the points (no residuals to use)', () => {
    const two = analyzeCampaign(
      inputs(false).filter((c) => c.temperatureC !== 25),
      options,
    );
    const coefficient = two.frequencyTempcoByUnit['unit-2'];
    expect(coefficient?.points).toBe(2);
    expect(coefficient?.ppmPerC).toBeCloseTo(100, 0);
    expect(Number.isFinite(coefficient?.uncertaintyPpmPerC)).toBe(true);
    expect(coefficient?.uncertaintyPpmPerC).toBeGreaterThan(0);
    expect(renderCampaignMarkdown(two)).toMatch(/\| Frequency tempco \|[^|]*\| [\d.]+ ± [\d.]+ ppm\/°C \|/);
  });

  it('no banner when no run came from the simulated bench', () => {
    const measured = analyzeCampaign(inputs(false), options);
    expect(renderCampaignHtml(measured)).not.toContain('SIMULATED BENCH');
    expect(renderCampaignMarkdown(measured)).not.toContain('SIMULATED BENCH');
    expect(renderCampaignCsv(measured)).toMatch(/,measured\n/);
  });

  it('Markdown escapes user text; CSV carries SI values with their uncertainties', () => {
    const md = renderCampaignMarkdown(analysis);
    expect(md).toContain('unit &lt;b&gt;1&lt;/b&gt;');
    expect(md).toContain('**SIMULATED BENCH');
    const csv = renderCampaignCsv(analysis).split('\n');
    const pushing = csv.find((l) => l.startsWith('pushing,'))?.split(',') ?? [];
    const header = (csv[0] as string).split(',');
    expect(Number(pushing[header.indexOf('typ')])).toBeCloseTo(200, 0);
    expect(Number(pushing[header.indexOf('typ_u')])).toBeGreaterThan(0);
  });
});
