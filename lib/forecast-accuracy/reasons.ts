import type { UncheckedReason } from "./types";

/**
 * Why a recorded change's forecast was not checked against a gas: a stable
 * code (UncheckedReason) and its words. Every change that is not paired gets
 * exactly one, decided in this order of precedence:
 *
 * 1. no_forecast      – nothing was stored to check;
 * 2. changed_again /  – before the window's end another FiO2 or PEEP change, or
 *    order_changed      an order change, came before any arterial gas in the window
 *                       (the earlier of the two; the order change at a tie);
 * 3. venous_only      – the window held a venous gas and no arterial one;
 * 4. gas_too_early    – the only arterial gases after the change came before the window;
 * 5. gas_too_late     – the first arterial gas after the change came after the window;
 * 6. no_arterial_gas  – no arterial gas at all after the change.
 */
export const UNCHECKED_REASONS: Readonly<
  Record<UncheckedReason, { label: string; definition: string }>
> = Object.freeze({
  no_forecast: {
    label: "No forecast stored",
    definition:
      "The change was recorded without a PaO2 forecast: it changed only PEEP or flow (the engine forecasts FiO2 changes only), or there was no usable arterial gas to start from, or the engine withheld the forecast. There is nothing to check.",
  },
  changed_again: {
    label: "Changed again before a gas",
    definition:
      "Another change of FiO2 or PEEP was applied after this one and before any arterial gas in the window, so no later gas measures this change alone.",
  },
  order_changed: {
    label: "Order changed before a gas",
    definition:
      "An order started, was superseded or was discontinued after this change and before any arterial gas in the window, so no later gas measures this change alone.",
  },
  venous_only: {
    label: "Only a venous gas in the window",
    definition:
      "The only gas in the window was venous. Venous PO2 says little about arterial PO2, so venous gases are never used to check a forecast.",
  },
  gas_too_early: {
    label: "Gas too early",
    definition:
      "The only arterial gases after the change were sampled before the window opened, before the new FiO2 can be taken to have reached a steady PaO2.",
  },
  gas_too_late: {
    label: "Gas too late",
    definition:
      "The first arterial gas after the change was sampled after the window closed, when the patient's own course may have moved PaO2 as much as the change did.",
  },
  no_arterial_gas: {
    label: "No arterial gas in the window",
    definition: "No arterial gas was sampled after the change.",
  },
});
