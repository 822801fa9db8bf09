/**
 * Whether a supply's voltage setpoint, read back, is the value that was
 * written. One rule for every readback (safe state, campaign, bring-up by
 * hand): 10 mV + 0.1 %, a supply's programming resolution and rounding
 * (common practice).
 */
export function setpointMatches(read: number, target: number): boolean {
  return Math.abs(read - target) <= 0.01 + 0.001 * Math.abs(target);
}
