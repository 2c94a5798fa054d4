import { getEnv } from "../env";
import type { DetectionOptions } from "./detect";

export type AlertConfig = DetectionOptions & {
  /** Unacknowledged this long → the next level is mailed. */
  escalateAfterMs: number;
};

/** The alert settings from the environment (README "Configuration"). */
export function alertConfig(): AlertConfig {
  const env = getEnv();
  return {
    sustainMs: env.ALERT_SUSTAIN_SECONDS * 1000,
    resolveMs: env.ALERT_RESOLVE_SECONDS * 1000,
    urgentBelowPct: env.ALERT_URGENT_BELOW_PCT,
    urgentMarginPct: env.ALERT_URGENT_MARGIN_PCT,
    escalateAfterMs: env.ALERT_ESCALATE_MINUTES * 60_000,
  };
}
