/**
 * Adaptive readings (issue 12 item 4): a sweep reading each point until the
 * standard error of its mean reaches a target, against the same sweep with a
 * fixed count per point large enough that its worst point meets the same
 * target (equal curve uncertainty), on the simulated relaxation DUT whose
 * jitter grows toward the stall edge (virtual clock, 10 ms gate).
 */
import { standardErrorHz } from '../../main/procedures/point-readings.ts';
import { readingsByPoint, simSweep } from '../testing/sim-sweep.ts';

const GATE_S = 0.01;
const TARGET_HZ = 20;

async function sweep(
  readings: { readings: { min: number; max: number; targetHz: number } } | { readingsPerPoint: number },
) {
  const { rows, durationS } = await simSweep('relaxation', 21, {
    start: 1.56,
    stop: 4,
    step: 0.04,
    gateS: GATE_S,
    ...readings,
    refineEdgeV: 0,
    settle: { mode: 'fixed', seconds: 0.02 },
    limits: { maxControlV: 5, currentLimitA: 0.02 },
  });
  const byPoint = readingsByPoint(rows);
  let worstSeHz = 0;
  let mostReadings = 0;
  for (const values of byPoint.values()) {
    mostReadings = Math.max(mostReadings, values.length);
    const se = standardErrorHz(new Float64Array(values), values.length, 1 / GATE_S);
    if (Number.isFinite(se)) worstSeHz = Math.max(worstSeHz, se);
  }
  return { durationS, worstSeHz, mostReadings, rows: rows.length, points: byPoint.size };
}

export async function runAdaptiveReadingsBench(): Promise<void> {
  const adaptive = await sweep({ readings: { min: 3, max: 200, targetHz: TARGET_HZ } });
  // Fixed N at equal curve uncertainty: the count the noisiest point needed, for every point.
  const fixed = await sweep({ readingsPerPoint: adaptive.mostReadings });
  const saved = 1 - adaptive.durationS / fixed.durationS;
  console.log(
    `  relaxation DUT 1.56–4 V by 40 mV, gate ${GATE_S * 1000} ms, target standard error of each point's mean ${TARGET_HZ} Hz (virtual clock)`,
  );
  console.log(
    `  adaptive {min 3, max 200}: ${adaptive.rows} readings over ${adaptive.points} points (most at one point ${adaptive.mostReadings}), ${adaptive.durationS.toFixed(2)} s, worst point SE ${adaptive.worstSeHz.toFixed(1)} Hz`,
  );
  console.log(
    `  fixed ${adaptive.mostReadings} per point (equal worst-point uncertainty): ${fixed.rows} readings, ${fixed.durationS.toFixed(2)} s, worst point SE ${fixed.worstSeHz.toFixed(1)} Hz`,
  );
  console.log(
    `  time saved by adaptive readings: ${(saved * 100).toFixed(0)} % (${(fixed.durationS - adaptive.durationS).toFixed(2)} s; no target given in the issue, printed for the record)`,
  );
}
