/**
 * A stall-edge bisection point approached from the oscillating side (issue
 * 12 item 3): the port falls from the top of the sweep toward a level below
 * the edge through the simulator's first-order lag (τ = 50 ms, common
 * practice for an RC-filtered tuning line); the counter counts over 100 ms
 * gates and reads no signal once the port is below the edge the whole gate.
 * Once the port is surely inside the bracket, a "no signal" is final.
 */
import { describe, expect, it } from 'vitest';
import { FirstOrderLag } from '../sim/first-order-lag.ts';
import { VirtualClock } from '../time/virtual-clock.ts';
import type { CounterReading } from './read-counter.ts';
import { settleAuto } from './settle.ts';
import { tauLearnedFromExactLag } from './testing/learned-tau.ts';
import { finalNoSignalAfterS } from './sweep.ts';

const TAU_S = 0.05;
const GATE_S = 0.1;
const EDGE_V = 1.55;
const bracket = { stalledV: 1.4, oscillatingV: 1.6, direction: 'up' as const };

async function fallTo(toV: number, finalAfterS: number | undefined) {
  const clock = new VirtualClock();
  const lag = new FirstOrderLag(TAU_S, 4.25);
  let atS = 0;
  const sentS: number[] = [];
  const read = async (): Promise<CounterReading> => {
    const startS = clock.now();
    sentS.push(startS);
    lag.step(startS - atS, toV);
    const startV = lag.value;
    await clock.sleep(GATE_S);
    lag.step(GATE_S, toV);
    atS = startS + GATE_S;
    // Counts while the port is above the edge during the gate (about 10 kHz/V above it).
    if (startV <= EDGE_V) return { status: 'no-signal', frequencyHz: Number.NaN, detail: 'nan', errorName: null };
    return { status: 'ok', frequencyHz: 10_000 * (startV - EDGE_V) + 1500, detail: null, errorName: null };
  };
  const tau = tauLearnedFromExactLag(TAU_S);
  const outcome = await clock.runUntil(
    settleAuto(
      clock,
      0,
      read,
      {
        gateS: GATE_S,
        maxS: 2,
        toleranceCounts: 1,
        scatterHz: 0,
        expectedStepHz: 400,
        recordedReadings: 3,
        finalNoSignalAfterS: finalAfterS,
      },
      tau,
      undefined,
      28_800,
    ),
  );
  return { outcome, sentS };
}

describe('settling at a stall-edge bisection point approached from above', () => {
  it('is final once the port is inside the bracket by the lag with τ 25 % longer', () => {
    // τ·1.25·ln((4.25 − 1.5)/(1.6 − 1.5)) = 62.5 ms · ln 27.5 ≈ 207 ms.
    expect(finalNoSignalAfterS(bracket, 4.25, 1.5, TAU_S)).toBeCloseTo(1.25 * TAU_S * Math.log(27.5), 9);
    // From below (rising through the stalled region), or with τ unknown: no shortcut.
    expect(finalNoSignalAfterS(bracket, 1.4, 1.5, TAU_S)).toBeUndefined();
    expect(finalNoSignalAfterS(bracket, 4.25, 1.5, null)).toBeUndefined();
    // Already inside the bracket: at once.
    expect(finalNoSignalAfterS(bracket, 1.55, 1.5, TAU_S)).toBe(0);
  });

  it('believes the first "no signal" read after that moment, well before the watching rules would', async () => {
    const finalAfterS = finalNoSignalAfterS(bracket, 4.25, 1.5, TAU_S) as number;
    const quick = await fallTo(1.5, finalAfterS);
    expect(quick.outcome.settled).toBe(true);
    expect(quick.outcome.last?.reading.status).toBe('no-signal');
    // Its command went out after the port was inside the bracket, and the port really was below the edge:
    // 4.25 → 1.5 with τ = 50 ms crosses 1.55 V at τ·ln(2.75/0.05) ≈ 200 ms.
    const lastSent = quick.sentS[quick.sentS.length - 1] as number;
    expect(lastSent).toBeGreaterThanOrEqual(finalAfterS);
    expect(lastSent).toBeGreaterThanOrEqual(TAU_S * Math.log(2.75 / 0.05));
    expect(quick.outcome.elapsedS).toBeLessThanOrEqual(finalAfterS + 2 * GATE_S);
    const usual = await fallTo(1.5, undefined);
    expect(usual.outcome.settled).toBe(true);
    expect(usual.outcome.elapsedS).toBeGreaterThan(quick.outcome.elapsedS + GATE_S);
  });
});
