import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { NotFoundError, ValidationError } from "../errors";
import {
  assessBloodGas,
  barometricPressureAtAltitude,
  type BloodGasAssessment,
  type BloodGasInput,
  ENGINE_VERSION,
  type Fio2Forecast,
  forecastFio2Change,
  type ForecastInput,
  type IndexValue,
  OxygenInputError,
  type PressureUnit,
  SOURCES,
  STANDARD_BAROMETRIC_PRESSURE,
} from "../oxygen";
import { forecastBasis, type ForecastBasis } from "./forecast-basis";
import { describeInputError, type TypedUnits } from "./messages";
import type { ParsedAssessRequest, ParsedForecastRequest } from "./schema";

/** What POST /api/v1/oxygenation/assess answers. */
export interface AssessResponse {
  engineVersion: string;
  /** The pressure unit the request was typed in; every number below carries its own unit. */
  pressureUnit: PressureUnit;
  /** The engine's input after conversion: pressures in mmHg, Hb in g/dL, FiO2 and SaO2 as fractions, SpO2 in %. */
  input: BloodGasInput & { barometricPressure: number };
  /** The barometric pressure used, with where it came from. */
  barometricPressure: IndexValue;
  assessment: BloodGasAssessment;
}

/** What POST /api/v1/oxygenation/forecast answers. */
export interface ForecastResponse {
  engineVersion: string;
  pressureUnit: PressureUnit;
  input: ForecastInput & { barometricPressure: number };
  barometricPressure: IndexValue;
  /** PaO2 in mmHg, SpO2 in %, shunt fraction as a fraction; every model with its range. */
  forecast: Fio2Forecast;
  basis: ForecastBasis;
}

/**
 * The barometric pressure for a request: the one given, else the one at the
 * altitude of the unit named (which must be one of the actor's), else 760 mmHg.
 */
async function resolveBarometricPressure(
  knex: Knex,
  actor: Actor,
  given: number | undefined,
  unitId: number | undefined,
): Promise<IndexValue> {
  if (given !== undefined) {
    return {
      value: given,
      unit: "mmHg",
      basis: {
        name: "Barometric pressure",
        formula: "as given",
        inputs: { PB: { value: given, unit: "mmHg" } },
        source: "Entered with the blood gas",
        assumptions: [],
      },
    };
  }
  if (unitId !== undefined) {
    // A unit outside the actor's assignment is answered like one that does not exist.
    const unit = actor.unitIds.includes(unitId)
      ? ((await knex("units").where({ id: unitId }).first("code", "altitude_m")) as
          { code: string; altitude_m: number } | undefined)
      : undefined;
    if (!unit) throw new NotFoundError("Unit not found among your units.");
    const value = barometricPressureAtAltitude(unit.altitude_m);
    return {
      value,
      unit: "mmHg",
      basis: {
        name: "Barometric pressure at the unit's altitude",
        formula: "P = 101325 × (1 − 2.25577e-5 × h)^5.25588 Pa, in mmHg",
        inputs: { h: { value: unit.altitude_m, unit: "m" } },
        source: SOURCES.icaoAtmosphere,
        assumptions: [
          `Standard atmosphere at ${unit.code}'s altitude; weather moves the real pressure by a few percent.`,
        ],
      },
    };
  }
  return {
    value: STANDARD_BAROMETRIC_PRESSURE,
    unit: "mmHg",
    basis: {
      name: "Barometric pressure",
      formula: "standard sea-level pressure",
      inputs: {},
      source: SOURCES.icaoAtmosphere,
      assumptions: ["No pressure or unit was given: sea level assumed."],
    },
  };
}

// Engine refusals become a 400 naming the field, in the unit the caller typed.
function runEngine<T>(units: TypedUnits, compute: () => T): T {
  try {
    return compute();
  } catch (error) {
    if (!(error instanceof OxygenInputError)) throw error;
    const { field, message } = describeInputError(error, units);
    throw new ValidationError(message, { [field]: [message] });
  }
}

/** Every oxygenation index of one blood gas, each with its basis (nothing is stored). */
export async function evaluateBloodGas(
  knex: Knex,
  actor: Actor,
  request: ParsedAssessRequest,
): Promise<AssessResponse> {
  const barometricPressure = await resolveBarometricPressure(
    knex,
    actor,
    request.input.barometricPressure,
    request.unitId,
  );
  const input = { ...request.input, barometricPressure: barometricPressure.value };
  const assessment = runEngine(request, () => assessBloodGas(input));
  return {
    engineVersion: ENGINE_VERSION,
    pressureUnit: request.pressureUnit,
    input,
    barometricPressure,
    assessment,
  };
}

/** The three-model forecast of PaO2 and SpO2 after a change of FiO2, each model with its basis. */
export async function forecastFio2(
  knex: Knex,
  actor: Actor,
  request: ParsedForecastRequest,
): Promise<ForecastResponse> {
  const barometricPressure = await resolveBarometricPressure(
    knex,
    actor,
    request.input.barometricPressure,
    request.unitId,
  );
  const input = { ...request.input, barometricPressure: barometricPressure.value };
  const forecast = runEngine(request, () => forecastFio2Change(input));
  return {
    engineVersion: ENGINE_VERSION,
    pressureUnit: request.pressureUnit,
    input,
    barometricPressure,
    forecast,
    basis: forecastBasis(input, forecast),
  };
}
