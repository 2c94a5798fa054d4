import type { OrderStep, TitrationOrder } from "../oxygen";
import { candidates, withinLimits } from "../oxygen/step-geometry";
import { DEFAULT_PARAMETERS, defaultOrder, type RehearsalParameters } from "./parameters";
import type { RehearsalSettings } from "./schema";

/** The steps each device's patients are titrated on: a stored table, or the default ladder (null). */
export type ProtocolSteps = { ventilated: readonly OrderStep[]; hfnc: readonly OrderStep[] | null };

/** Why a protocol cannot run, per form field. */
export type ProtocolProblem = { field: "ventilatedTableId" | "hfncTableId"; message: string };

const flows = (steps: readonly OrderStep[]) =>
  steps.flatMap((s) => (s.flow === undefined ? [] : [s.flow]));

/**
 * The orders the form's figures and tables make: one band for both devices,
 * each device's own FiO2 limits, PEEP limits for the ventilated, and the
 * high-flow table's own flows as its flow limits (flow does not move the
 * virtual patient's saturation).
 */
export function protocolOrders(
  s: RehearsalSettings,
  steps: ProtocolSteps,
): Record<"hfnc" | "ventilator", TitrationOrder> {
  const band = { lower: s.spo2Lower, upper: s.spo2Upper };
  const hfncSteps = steps.hfnc ?? defaultOrder("hfnc").steps;
  const hfncFlows = flows(hfncSteps);
  return {
    ventilator: {
      spo2Target: band,
      limits: {
        fio2Min: s.ventilatedFio2Min,
        fio2Max: s.ventilatedFio2Max,
        peepMin: s.peepMin,
        peepMax: s.peepMax,
      },
      steps: steps.ventilated,
    },
    hfnc: {
      spo2Target: band,
      limits: {
        fio2Min: s.hfncFio2Min,
        fio2Max: s.hfncFio2Max,
        ...(hfncFlows.length
          ? { flowMin: Math.min(...hfncFlows), flowMax: Math.max(...hfncFlows) }
          : {}),
      },
      steps: hfncSteps,
    },
  };
}

/** A protocol the engine cannot titrate on: a table with no step inside its limits. */
export function protocolProblems(
  orders: Record<"hfnc" | "ventilator", TitrationOrder>,
): ProtocolProblem[] {
  const usable = (o: TitrationOrder) => candidates(o.steps).some((c) => withinLimits(c, o.limits));
  const problems: ProtocolProblem[] = [];
  const { ventilator: v, hfnc: h } = orders;
  if (!usable(v))
    problems.push({
      field: "ventilatedTableId",
      message: `No step of the ventilated patients' table lies within FiO2 ${v.limits.fio2Min}–${v.limits.fio2Max} and PEEP ${v.limits.peepMin}–${v.limits.peepMax} cmH2O.`,
    });
  if (!usable(h))
    problems.push({
      field: "hfncTableId",
      message: `No step of the high-flow patients' table lies within FiO2 ${h.limits.fio2Min}–${h.limits.fio2Max}.`,
    });
  return problems;
}

/** The engine's parameters for a run: the defaults, with the form's care figures and the protocol. */
export function rehearsalParameters(
  s: RehearsalSettings,
  orders: Record<"hfnc" | "ventilator", TitrationOrder>,
  base: RehearsalParameters = DEFAULT_PARAMETERS,
): RehearsalParameters {
  const care = base.care;
  return {
    ...base,
    care: {
      ...care,
      checkEveryMinutes: s.checkEveryMinutes,
      detection: {
        ...care.detection,
        sustainMs: s.sustainSeconds * 1000,
        sustainShare: s.sustainSharePct / 100,
        urgentBelowPct: s.urgentBelowPct,
        urgentSustainMs: s.urgentSustainSeconds * 1000,
      },
      escalateAfterMinutes: s.escalateAfterMinutes,
      nurseResponse: { ...care.nurseResponse, medianMinutes: s.nurseResponseMinutes },
      therapist: { ...care.therapist, medianMinutes: s.therapistMinutes },
    },
    protocol: orders,
  };
}
