/**
 * The order a campaign visits its conditions. A unit change means opening
 * the chamber door, which ruins any soak and, cold, lets frost in: so units
 * are the outer loop (the fewest possible changes, each at the safe
 * temperature). Within a unit the chamber walks the temperatures in one
 * direction, starting from the end nearer where it stands (the safe
 * temperature), so it never travels back over ground it has covered. At each
 * temperature every supply corner is swept: a supply step settles in
 * milliseconds, a chamber step takes an hour.
 */

export interface CampaignCondition {
  /** Position in the campaign, 0-based; stable across resumes. */
  index: number;
  unit: string;
  temperatureC: number;
  supplyV: number;
}

export function orderConditions(plan: {
  units: readonly string[];
  temperaturesC: readonly number[];
  supplyV: readonly number[];
  safeC: number;
}): CampaignCondition[] {
  const temps = [...new Set(plan.temperaturesC)].sort((a, b) => a - b);
  const supplies = [...new Set(plan.supplyV)];
  const lowFirst =
    Math.abs((temps[0] as number) - plan.safeC) <= Math.abs((temps[temps.length - 1] as number) - plan.safeC);
  const walk = lowFirst ? temps : [...temps].reverse();
  const out: CampaignCondition[] = [];
  for (const unit of plan.units) {
    for (const temperatureC of walk) {
      for (const supplyV of supplies) out.push({ index: out.length, unit, temperatureC, supplyV });
    }
  }
  return out;
}

/** Chamber moves and unit changes of an order (for the plan summary and tests). */
export function orderCost(
  order: readonly CampaignCondition[],
  safeC: number,
): { chamberTravelC: number; chamberMoves: number; unitChanges: number } {
  let at = safeC;
  let travel = 0;
  let moves = 0;
  let changes = 0;
  let unit: string | null = null;
  for (const c of order) {
    if (unit !== null && c.unit !== unit) {
      changes++;
      // The door opens at the safe temperature.
      if (at !== safeC) {
        travel += Math.abs(at - safeC);
        moves++;
        at = safeC;
      }
    }
    unit = c.unit;
    if (c.temperatureC !== at) {
      travel += Math.abs(c.temperatureC - at);
      moves++;
      at = c.temperatureC;
    }
  }
  return { chamberTravelC: travel, chamberMoves: moves, unitChanges: changes };
}
