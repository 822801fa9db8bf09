/**
 * The plan editor's text: JSON checked against the one campaign-plan schema
 * as the operator types, every problem on its own line naming the field.
 */
import { parseBoundedJson } from '../../contract/bounded-json.ts';
import { campaignPlanSchema, type CampaignPlanInput } from '../../contract/campaign-plan.ts';
import { describeIssues } from '../../contract/schema-kit.ts';

export type PlanCheck = { ok: true; plan: unknown } | { ok: false; problems: string[] };

export function checkPlanText(text: string): PlanCheck {
  let json: unknown;
  try {
    json = parseBoundedJson(text);
  } catch (error) {
    return { ok: false, problems: [`not valid JSON: ${error instanceof Error ? error.message : String(error)}`] };
  }
  const parsed = campaignPlanSchema.safeParse(json);
  if (!parsed.success) return { ok: false, problems: describeIssues(parsed.error).split('\n') };
  return { ok: true, plan: json };
}

/** A starting point: two temperatures, one supply, two units, a short sweep; edit before use. */
export const STARTER_PLAN: CampaignPlanInput = {
  temperaturesC: [25, 40],
  supplyV: ['5V'],
  maxSupplyV: '5.5V',
  units: ['unit-1', 'unit-2'],
  soak: { toleranceC: 1, maxSlopeCPerMin: 0.5, dwellS: '1min', timeoutS: '1h', readIntervalS: '10s' },
  chamber: { minC: -40, maxC: 85, maxRateCPerMin: 3 },
  sweep: {
    start: '2V',
    stop: '4V',
    step: '250mV',
    readingsPerPoint: 2,
    gateS: '100ms',
    settle: { mode: 'fixed', seconds: '50ms' },
    refineEdgeV: 0,
    limits: { maxControlV: '5V', currentLimitA: '20mA' },
  },
  safeC: 25,
  nominalControlV: '3V',
};
