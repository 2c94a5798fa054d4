import { getEnv } from "../env";
import type { DetectionOptions } from "./detect";

export type AlertConfig = DetectionOptions & {
  /** Unacknowledged this long → the next level is mailed. */
  escalateAfterMs: number;
  /** "Order limits reached" waits for an SpO2 taken this long after the change to the limit. */
  limitsSettleMs: number;
};

/** The alert settings from the environment (README "Configuration"). */
export function alertConfig(): AlertConfig {
  const env = getEnv();
  return {
    sustainMs: env.ALERT_SUSTAIN_SECONDS * 1000,
    sustainShare: env.ALERT_SUSTAIN_SHARE_PCT / 100,
    urgentSustainMs: env.ALERT_URGENT_SUSTAIN_SECONDS * 1000,
    resolveMs: env.ALERT_RESOLVE_SECONDS * 1000,
    urgentBelowPct: env.ALERT_URGENT_BELOW_PCT,
    urgentMarginPct: env.ALERT_URGENT_MARGIN_PCT,
    signalLossMs: env.ALERT_SIGNAL_LOSS_SECONDS * 1000,
    escalateAfterMs: env.ALERT_ESCALATE_MINUTES * 60_000,
    limitsSettleMs: env.ALERT_LIMITS_SETTLE_MINUTES * 60_000,
  };
}
