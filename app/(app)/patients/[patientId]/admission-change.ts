import { notFound } from "next/navigation";
import { z } from "zod";
import { admissionChangeContext } from "@/lib/admissions/page-data";
import { pagePermission } from "@/lib/auth/page-guard";
import { db } from "@/lib/db";
import { NotFoundError } from "@/lib/errors";

const paramsSchema = z.object({ patientId: z.coerce.number().int().positive() });

/**
 * The door of the move and discharge pages: who may, the patient of the path,
 * and what the change would touch. Not admitted, discharged, not existing and
 * another unit's patient are the same 404.
 */
export async function loadAdmissionChange(params: Promise<{ patientId: string }>) {
  const actor = await pagePermission("admission.manage");
  const parsed = paramsSchema.safeParse(await params);
  if (!parsed.success) notFound();
  const context = await admissionChangeContext(db(), actor, parsed.data.patientId).catch(
    (error: unknown) => {
      if (error instanceof NotFoundError) notFound();
      throw error;
    },
  );
  return { actor, ...context };
}
