/**
 * Whether a blood gas still represents the patient well enough to forecast
 * from. Pure. A gas older than the site's limit (FORECAST_GAS_MAX_AGE_MINUTES,
 * 4 h by default) is not used unless a clinician chooses it; its age is said
 * either way, so nobody forecasts from a morning gas at night unawares.
 */
export type GasFreshness = {
  /** Minutes between sampling and now (0 for a gas stamped in the future). */
  ageMinutes: number;
  maxAgeMinutes: number;
  fresh: boolean;
};

export function gasFreshness(
  sampledAt: Date | string,
  now: Date,
  maxAgeMinutes: number,
): GasFreshness {
  const ageMinutes = Math.max(
    0,
    Math.floor((now.getTime() - new Date(sampledAt).getTime()) / 60_000),
  );
  return { ageMinutes, maxAgeMinutes, fresh: ageMinutes <= maxAgeMinutes };
}

/** "45 min", "6 h 10 min", "2 d 3 h". */
export function formatAge(minutes: number): string {
  if (minutes < 60) return `${minutes} min`;
  if (minutes < 48 * 60) {
    const m = minutes % 60;
    return `${Math.floor(minutes / 60)} h${m ? ` ${m} min` : ""}`;
  }
  const h = Math.floor(minutes / 60) % 24;
  return `${Math.floor(minutes / 1440)} d${h ? ` ${h} h` : ""}`;
}

/** The caveat every forecast from (or without) this gas carries. */
export function gasAgeCaveat(f: GasFreshness, used: boolean): string {
  const age = `The latest arterial blood gas is ${formatAge(f.ageMinutes)} old`;
  const limit = formatAge(f.maxAgeMinutes);
  if (f.fresh) return `${age} (limit ${limit}).`;
  return used
    ? `${age}, older than the ${limit} limit: used because a clinician chose it; it may no longer represent the patient.`
    : `${age}, older than the ${limit} limit: not used for the forecast (choose it to forecast from it anyway).`;
}
