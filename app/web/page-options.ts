/** Settings the web edition reads from its address (pure, so tests need no page). */

/** `?sim-speed=N`: the simulated bench runs N× real time (1–100; default 1, as on the desktop). */
export function simSpeedFrom(search: string): number {
  const raw = new URLSearchParams(search).get('sim-speed');
  if (raw === null) return 1;
  const speed = Number(raw);
  return Number.isFinite(speed) && speed >= 1 && speed <= 100 ? speed : 1;
}
