"use server";

import type { ActionResult } from "../action-result";
import { runWriteAction } from "../boundary/next";
import {
  createBedOperation,
  createUnitOperation,
  updateBedOperation,
  updateUnitOperation,
} from "./operations";
import type { BedView, UnitDetail } from "./queries";
import type { UnitUpdateResult } from "./service";

const unitPages = (unitId: number) => ["/admin/units", `/admin/units/${unitId}`, "/board"];

export async function createUnitAction(input: unknown): Promise<ActionResult<UnitDetail>> {
  return runWriteAction(createUnitOperation, input, (unit) => unitPages(unit.id));
}

export async function updateUnitAction(input: unknown): Promise<ActionResult<UnitUpdateResult>> {
  return runWriteAction(updateUnitOperation, input, (r) => unitPages(r.unit.id));
}

export async function createBedAction(input: unknown): Promise<ActionResult<BedView>> {
  return runWriteAction(createBedOperation, input, (bed) => unitPages(bed.unitId));
}

export async function updateBedAction(input: unknown): Promise<ActionResult<BedView>> {
  return runWriteAction(updateBedOperation, input, (bed) => unitPages(bed.unitId));
}
