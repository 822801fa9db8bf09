/**
 * Scriptable ambient temperature for the simulated bench: constant, a slow
 * sinusoid (an air-conditioning cycle), a ramp, or piecewise-linear points.
 * It drives the thermometer's readings and the DUT's temperature.
 */
import { z } from 'zod';

export const ambientProfileSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('constant'), temperatureC: z.number() }),
  z.object({
    kind: z.literal('sinusoid'),
    meanC: z.number(),
    amplitudeC: z.number().nonnegative(),
    periodS: z.number().positive(),
    phaseRad: z.number().default(0),
  }),
  z.object({
    kind: z.literal('ramp'),
    startC: z.number(),
    ratePerHourC: z.number(),
    minC: z.number().default(-40),
    maxC: z.number().default(85),
  }),
  z.object({
    kind: z.literal('points'),
    /** [time s, temperature °C] pairs, ascending in time; held flat outside. */
    points: z
      .array(z.tuple([z.number().nonnegative(), z.number()]))
      .min(1)
      .refine(
        (pts) => pts.every((p, i) => i === 0 || p[0] > (pts[i - 1] as [number, number])[0]),
        'points must ascend in time',
      ),
  }),
]);

export type AmbientProfile = z.infer<typeof ambientProfileSchema>;

/** A lab's air conditioning: 23 °C ± 1.5 °C over 6 hours. */
export const DEFAULT_AMBIENT: AmbientProfile = {
  kind: 'sinusoid',
  meanC: 23,
  amplitudeC: 1.5,
  periodS: 6 * 3600,
  phaseRad: 0,
};

/** Temperature at `elapsedS` seconds after the bench started. */
export function ambientAt(profile: AmbientProfile, elapsedS: number): number {
  switch (profile.kind) {
    case 'constant':
      return profile.temperatureC;
    case 'sinusoid':
      return (
        profile.meanC + profile.amplitudeC * Math.sin((2 * Math.PI * elapsedS) / profile.periodS + profile.phaseRad)
      );
    case 'ramp':
      return Math.min(profile.maxC, Math.max(profile.minC, profile.startC + (profile.ratePerHourC * elapsedS) / 3600));
    case 'points': {
      const pts = profile.points;
      const first = pts[0] as [number, number];
      if (elapsedS <= first[0]) return first[1];
      for (let i = 1; i < pts.length; i++) {
        const [t1, c1] = pts[i] as [number, number];
        if (elapsedS <= t1) {
          const [t0, c0] = pts[i - 1] as [number, number];
          return c0 + ((c1 - c0) * (elapsedS - t0)) / (t1 - t0);
        }
      }
      return (pts[pts.length - 1] as [number, number])[1];
    }
  }
}
