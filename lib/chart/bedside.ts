import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { getCurrentOrder, type OrderView } from "../orders/queries";
import {
  barometricPressureAtAltitude,
  proposeStep,
  type OrderStep,
  type Proposal,
} from "../oxygen";
import type { Device } from "../devices";
import { alertConfig } from "../alerts/config";
import { gasAgeCaveat, gasFreshness, type GasFreshness } from "../blood-gases/freshness";
import { getEnv } from "../env";
import { findReadableAdmission, type OpenAdmission } from "../admissions/access";
import { orderStepsOf } from "../step-tables/steps";

export type BedsideSettings = {
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  peep: number | null;
  flow: number | null;
  version: number;
  updatedAt: string;
  lastReassessedAt: string;
};

export type LatestReadingView = {
  id: number;
  takenAt: string;
  spo2: number;
  respiratoryRate: number | null;
  device: Device;
  fio2: number;
  fio2Estimated: boolean;
  flow: number | null;
};

export type LatestBloodGasView = {
  id: number;
  sampledAt: string;
  sampleType: "arterial" | "venous";
  pao2: number;
  paco2: number;
  hb: number | null;
  fio2: number;
  fio2Estimated: boolean;
  peep: number | null;
  pfRatio: number | null;
};

export type BedsideContext = {
  admission: OpenAdmission;
  barometricPressure: number;
  order: OrderView | null;
  steps: OrderStep[];
  settings: BedsideSettings | null;
  latestReading: LatestReadingView | null;
  latestBloodGas: LatestBloodGasView | null;
  /** The newest arterial gas (forecasts start from arterial blood only), with its age against the site's limit. */
  latestArterialGas: (LatestBloodGasView & { freshness: GasFreshness }) | null;
  /** Whether the forecast and proposal use that gas: a fresh one, or a stale one a clinician chose. */
  forecastUsesGas: boolean;
  proposal: Proposal | null;
  proposalError: string | null;
};

/** The steps of the order's table, as the engine takes them. */
export async function loadSteps(knex: Knex, stepTableId: number | null): Promise<OrderStep[]> {
  if (stepTableId === null) return [];
  const rows = (await knex("step_table_rows")
    .where({ step_table_id: stepTableId })
    .orderBy("position")) as {
    fio2_min: number;
    fio2_max: number;
    peep_min_cmh2o: number | null;
    peep_max_cmh2o: number | null;
    flow_l_min: number | null;
  }[];
  return orderStepsOf(
    rows.map((r) => ({
      fio2Min: r.fio2_min,
      fio2Max: r.fio2_max,
      peepMin: r.peep_min_cmh2o,
      peepMax: r.peep_max_cmh2o,
      flow: r.flow_l_min,
    })),
  );
}

/**
 * The engine's proposal from the order's step table for the settings in use,
 * the latest reading and the gas the forecast may start from: what the
 * bedside shows, and what a recorded adjustment is compared with.
 */
export function proposeAtBedside(input: {
  order: OrderView;
  steps: OrderStep[];
  current: { fio2: number; peep: number | null; flow: number | null };
  latestReading: { spo2: number; fio2: number };
  gas: Pick<LatestBloodGasView, "pao2" | "paco2" | "fio2" | "hb" | "peep"> | null;
  barometricPressure: number;
}): Proposal {
  const { order, current, gas } = input;
  const cfg = alertConfig();
  return proposeStep({
    order: {
      spo2Target: order.spo2Band,
      pao2Target: order.pao2Band,
      limits: {
        fio2Min: order.limits.fio2Min,
        fio2Max: order.limits.fio2Max,
        ...(order.limits.peepMin !== null ? { peepMin: order.limits.peepMin } : {}),
        ...(order.limits.peepMax !== null ? { peepMax: order.limits.peepMax } : {}),
        ...(order.limits.flowMin !== null ? { flowMin: order.limits.flowMin } : {}),
        ...(order.limits.flowMax !== null ? { flowMax: order.limits.flowMax } : {}),
      },
      steps: input.steps,
    },
    current: {
      fio2: current.fio2,
      ...(current.peep !== null ? { peep: current.peep } : {}),
      ...(current.flow !== null ? { flow: current.flow } : {}),
    },
    latestReading: { spo2: input.latestReading.spo2, fio2: input.latestReading.fio2 },
    latestBloodGas: gas
      ? {
          pao2: gas.pao2,
          paco2: gas.paco2,
          fio2: gas.fio2,
          ...(gas.hb !== null ? { hemoglobin: gas.hb } : {}),
          ...(gas.peep !== null ? { peep: gas.peep } : {}),
        }
      : null,
    barometricPressure: input.barometricPressure,
    urgency: { belowPct: cfg.urgentBelowPct, marginPct: cfg.urgentMarginPct },
  });
}

/**
 * The latest arterial gas of an admission with its age against the site's
 * limit: what a forecast starts from (the bedside proposal, a recorded change).
 */
export async function loadLatestArterialGas(knex: Knex, admissionId: number, now: Date) {
  const row = (await knex("blood_gases")
    .where({ admission_id: admissionId, sample_type: "arterial" })
    .orderBy("sampled_at", "desc")
    .first()) as GasRow | undefined;
  const gas = gasView(row);
  const maxAgeMinutes = getEnv().FORECAST_GAS_MAX_AGE_MINUTES;
  return gas ? { ...gas, freshness: gasFreshness(gas.sampledAt, now, maxAgeMinutes) } : null;
}

/**
 * What the bedside forms show: the order in effect, the applied settings, the
 * latest reading and blood gas, and the engine's proposal for the next step.
 */
export async function getBedsideContext(
  knex: Knex,
  actor: Actor,
  patientId: number,
  options: { useStaleBloodGas?: boolean; now?: Date } = {},
): Promise<BedsideContext> {
  const now = options.now ?? new Date();
  const admission = await findReadableAdmission(knex, actor, patientId);
  const barometricPressure = barometricPressureAtAltitude(admission.altitudeM);
  // Rows are typed by assertion below, at the knex boundary.
  const first = (q: Knex.QueryBuilder): Promise<unknown> => q.first() as Promise<unknown>;
  const [order, settingsRow, readingRow, gasRow, latestArterialGas] = await Promise.all([
    getCurrentOrder(knex, patientId),
    first(knex("bedside_settings").where({ admission_id: admission.admissionId })),
    first(
      knex("readings").where({ admission_id: admission.admissionId }).orderBy("taken_at", "desc"),
    ),
    first(
      knex("blood_gases")
        .where({ admission_id: admission.admissionId })
        .orderBy("sampled_at", "desc"),
    ),
    loadLatestArterialGas(knex, admission.admissionId, now),
  ]);
  const s = settingsRow as
    | {
        device: Device;
        fio2: number;
        fio2_estimated: number;
        peep_cmh2o: number | null;
        flow_l_min: number | null;
        version: number;
        updated_at: Date;
        last_reassessed_at: Date;
      }
    | undefined;
  const settings: BedsideSettings | null = s
    ? {
        device: s.device,
        fio2: s.fio2,
        fio2Estimated: Boolean(s.fio2_estimated),
        peep: s.peep_cmh2o,
        flow: s.flow_l_min,
        version: s.version,
        updatedAt: s.updated_at.toISOString(),
        lastReassessedAt: s.last_reassessed_at.toISOString(),
      }
    : null;
  const r = readingRow as
    | {
        id: number;
        taken_at: Date;
        spo2_pct: number;
        respiratory_rate_per_min: number | null;
        device: Device;
        fio2: number;
        fio2_estimated: number;
        flow_l_min: number | null;
      }
    | undefined;
  const latestReading: LatestReadingView | null = r
    ? {
        id: Number(r.id),
        takenAt: r.taken_at.toISOString(),
        spo2: r.spo2_pct,
        respiratoryRate: r.respiratory_rate_per_min,
        device: r.device,
        fio2: r.fio2,
        fio2Estimated: Boolean(r.fio2_estimated),
        flow: r.flow_l_min,
      }
    : null;
  const latestBloodGas = gasView(gasRow as GasRow | undefined);
  const forecastUsesGas =
    latestArterialGas !== null &&
    (latestArterialGas.freshness.fresh || options.useStaleBloodGas === true);

  const steps = order ? await loadSteps(knex, order.stepTableId) : [];
  let proposal: Proposal | null = null;
  let proposalError: string | null = null;
  if (order && settings && latestReading) {
    try {
      proposal = proposeAtBedside({
        order,
        steps,
        current: settings,
        latestReading,
        gas: latestArterialGas && forecastUsesGas ? latestArterialGas : null,
        barometricPressure,
      });
      if (latestArterialGas)
        proposal.caveats.unshift(gasAgeCaveat(latestArterialGas.freshness, forecastUsesGas));
    } catch (error) {
      // A proposal is advice; a recorded value the engine refuses must not hide the page.
      proposalError =
        error instanceof Error ? error.message : "The engine could not propose a step.";
    }
  }
  return {
    admission,
    barometricPressure,
    order,
    steps,
    settings,
    latestReading,
    latestBloodGas,
    latestArterialGas,
    forecastUsesGas,
    proposal,
    proposalError,
  };
}

type GasRow = {
  id: number;
  sampled_at: Date;
  sample_type: "arterial" | "venous";
  pao2_mmhg: number;
  paco2_mmhg: number;
  hb_g_dl: number | null;
  fio2: number;
  fio2_estimated: number;
  peep_cmh2o: number | null;
  pf_ratio: number | null;
};

function gasView(g: GasRow | undefined): LatestBloodGasView | null {
  return g
    ? {
        id: g.id,
        sampledAt: g.sampled_at.toISOString(),
        sampleType: g.sample_type,
        pao2: g.pao2_mmhg,
        paco2: g.paco2_mmhg,
        hb: g.hb_g_dl,
        fio2: g.fio2,
        fio2Estimated: Boolean(g.fio2_estimated),
        peep: g.peep_cmh2o,
        pfRatio: g.pf_ratio,
      }
    : null;
}
