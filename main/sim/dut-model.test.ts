import { describe, expect, it } from 'vitest';
import { builtinDut } from './builtin-duts.ts';
import { dutFrequencyHz, type DutConditions } from './dut-model.ts';
import { parseDutParams, type RelaxationDutParams, type VaractorDutParams } from './dut-params.ts';
import { chargeVoltage, rcTransitS, relaxationCore } from './dut-relaxation.ts';
import { junctionCapacitanceF, lcResonanceHz, varactorCore } from './dut-varactor.ts';

const relax = builtinDut('relaxation') as RelaxationDutParams;
const varactor = builtinDut('varactor') as VaractorDutParams;

describe('relaxation DUT (RC charging law)', () => {
  it('one time constant charges to 63.2 % of the step (common practice)', () => {
    // From 0 toward 1 V: reaching 1 − 1/e takes exactly RC.
    expect(rcTransitS(1e-3, 0, 1 - Math.exp(-1), 1)).toBeCloseTo(1e-3, 12);
    expect(rcTransitS(1e-3, 0, 1.2, 1)).toBe(Number.POSITIVE_INFINITY);
  });

  it('period matches t = RC·ln((Vc − V0)/(Vc − V1)) + discharge, computed by hand', () => {
    // Horowitz & Hill, The Art of Electronics, 3rd ed., §1.4 (from memory): v(t) = Vc + (v0 − Vc)e^(−t/RC).
    // Built-in part: R = 100 kΩ, C = 1 nF (RC = 100 µs), V0 = 1.1 V, V1 = 2.0 V,
    // Vc = 1.0·Vtune + 0.45 V; discharge through 10 kΩ (RdC = 10 µs) toward 0 V.
    // At Vtune = 2.55 V: Vc = 3.0 V.
    //   charge    = 100 µs · ln(1.9/1.0)  = 100 µs · 0.641853886 = 64.1853886 µs
    //   discharge = 10 µs · ln(2.0/1.1)   = 10 µs · 0.597837001  = 5.97837001 µs
    //   period    = 70.1637586 µs  → f = 14 252.372 Hz
    const core = relaxationCore(relax, 2.55, 5.0);
    expect(core.oscillating).toBe(true);
    expect(core.frequencyHz).toBeCloseTo(14_252.372, 2);
  });

  it('stops oscillating when the charging voltage no longer exceeds V1 (common practice)', () => {
    // Vc = V1 at Vtune = 2.0 − 0.45 = 1.55 V.
    expect(relaxationCore(relax, 1.55, 5).oscillating).toBe(false);
    expect(relaxationCore(relax, 1.0, 5).frequencyHz).toBe(0);
    const justAbove = relaxationCore(relax, 1.56, 5);
    expect(justAbove.oscillating).toBe(true);
    expect(justAbove.frequencyHz).toBeGreaterThan(0);
  });

  it('period jitter grows toward the stall edge, as σv / (dv/dt at V1)', () => {
    const far = relaxationCore(relax, 4.0, 5).cycleJitter;
    const near = relaxationCore(relax, 1.6, 5).cycleJitter;
    const nearer = relaxationCore(relax, 1.56, 5).cycleJitter;
    expect(near).toBeGreaterThan(5 * far);
    expect(nearer).toBeGreaterThan(near);
    // Hand check at Vtune = 2.55 V (Vc = 3.0 V): slopes 1.0 V/100 µs = 1e4 V/s at V1 and
    // 1.1 V/10 µs = 1.1e5 V/s at V0; σt = 2 mV·√(1/1e4² + 1/1.1e5²) = 0.200826 µs.
    const core = relaxationCore(relax, 2.55, 5);
    const periodS = 1 / core.frequencyHz;
    expect(core.cycleJitter * periodS).toBeCloseTo(0.200826e-6, 10);
  });

  it('charging voltage is limited by the supply headroom (top of the tuning range flattens)', () => {
    expect(chargeVoltage(relax, 4.5, 5)).toBeCloseTo(4.7, 12);
    expect(relaxationCore(relax, 4.5, 5).frequencyHz).toBeCloseTo(relaxationCore(relax, 4.4, 5).frequencyHz, 9);
  });
});

describe('varactor-tuned LC DUT (junction-capacitance law)', () => {
  it('Cj(V) = Cj0/(1 + V/φ)^γ: abrupt junction halves at V = 3φ', () => {
    // Sze & Ng, Physics of Semiconductor Devices, 3rd ed., ch. 2 (from memory): γ = 1/2 for an abrupt junction.
    expect(junctionCapacitanceF(0, 20e-12, 0.7, 0.5)).toBeCloseTo(20e-12, 20);
    expect(junctionCapacitanceF(2.1, 20e-12, 0.7, 0.5)).toBeCloseTo(10e-12, 20);
  });

  it('f = 1/(2π√(LC)): 8 nH with Cj(2 V) + 4 pF, computed by hand', () => {
    // Cj(2 V) = 30 pF / (1 + 2/0.7)^0.75 = 30 pF / 2.75232 = 10.89989 pF; C = 14.89989 pF;
    // f = 1 / (2π·√(8 nH · 14.89989 pF)) = 460.98 MHz.
    expect(lcResonanceHz(1e-6, 1e-12)).toBeCloseTo(159_154_943, 0);
    const core = varactorCore(varactor, 2, 3.3);
    expect(core.frequencyHz / 1e6).toBeCloseTo(460.982, 3);
    // Tuning is monotonic: more reverse bias, less capacitance, higher frequency.
    expect(varactorCore(varactor, 4.5, 3.3).frequencyHz).toBeGreaterThan(varactorCore(varactor, 0.5, 3.3).frequencyHz);
    expect(varactorCore(varactor, -0.5, 3.3).oscillating).toBe(false);
  });
});

describe('environment terms', () => {
  const base: DutConditions = { tuneNodeV: 2.55, supplyV: 5, temperatureC: 25, poweredForS: 1e9 };

  it('temperature coefficient in ppm/°C', () => {
    const f25 = dutFrequencyHz(relax, base);
    const f35 = dutFrequencyHz(relax, { ...base, temperatureC: 35 });
    expect((f35 - f25) / f25 / 10 / 1e-6).toBeCloseTo(relax.tempcoPpmPerC, 6);
  });

  it('supply pushing in Hz/V', () => {
    const f5 = dutFrequencyHz(relax, base);
    const f55 = dutFrequencyHz(relax, { ...base, supplyV: 5.5 });
    expect((f55 - f5) / 0.5).toBeCloseTo(relax.pushingHzPerV, 6);
  });

  it('warm-up drift settles exponentially from the power-on offset', () => {
    const settled = dutFrequencyHz(relax, base);
    const atOn = dutFrequencyHz(relax, { ...base, poweredForS: 0 });
    const atTau = dutFrequencyHz(relax, { ...base, poweredForS: relax.warmup.tauS });
    expect((atOn / settled - 1) / 1e-6).toBeCloseTo(relax.warmup.offsetPpm, 6);
    expect((atTau / settled - 1) / 1e-6).toBeCloseTo(relax.warmup.offsetPpm / Math.E, 6);
    expect(dutFrequencyHz(relax, { ...base, poweredForS: null })).toBe(0);
    expect(dutFrequencyHz(relax, { ...base, supplyV: 3.9 })).toBe(0);
  });
});

describe('DUT parameter files', () => {
  it('names the bad field', () => {
    const broken = structuredClone(relax) as Record<string, unknown>;
    (broken.timing as Record<string, unknown>).capacitanceF = 'big';
    expect(() => parseDutParams(broken, 'my.json')).toThrow(/my\.json.*timing\.capacitanceF/);
    const inverted = structuredClone(relax);
    inverted.thresholds.upperV = 0.5;
    expect(() => parseDutParams(inverted)).toThrow(/thresholds\.upperV/);
    expect(() => parseDutParams({ kind: 'crystal' })).toThrow(/kind/);
  });
});
