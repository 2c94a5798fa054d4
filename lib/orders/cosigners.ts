import type { Knex } from "knex";

type Person = { id: number; name: string };

/**
 * Who may co-sign a verbal or telephone order: the prescriber it names, or a
 * physician its unit designates (`unit_cosigners`) — never any physician, as
 * the co-signature records that the order is what the prescriber meant.
 */
export type Cosigners = { prescriber: Person; designated: Person[] };

export function mayCosign(userId: number, cosigners: Cosigners): boolean {
  return cosigners.prescriber.id === userId || cosigners.designated.some((p) => p.id === userId);
}

/** Who may co-sign, in words: the refusal's message and the order page's note. */
export function cosignersText(cosigners: Cosigners): string {
  const others = cosigners.designated.filter((p) => p.id !== cosigners.prescriber.id);
  const names = others.map((p) => p.name);
  const list =
    names.length <= 1 ? names.join("") : `${names.slice(0, -1).join(", ")} or ${names.at(-1)}`;
  return others.length === 0
    ? `Only the prescriber named on the order, ${cosigners.prescriber.name}, may co-sign it; this unit designates no other co-signer.`
    : `Only the prescriber named on the order, ${cosigners.prescriber.name}, or a co-signer this unit designates (${list}) may co-sign it.`;
}

/**
 * The designated co-signers of each unit: active physicians still assigned to
 * the unit, so a designation lapses with the assignment.
 */
export async function unitCosigners(
  knex: Knex | Knex.Transaction,
  unitIds: readonly number[],
): Promise<Map<number, Person[]>> {
  const byUnit = new Map<number, Person[]>(unitIds.map((id) => [id, []]));
  if (unitIds.length === 0) return byUnit;
  const rows = (await knex("unit_cosigners as c")
    .join("users as u", "u.id", "c.user_id")
    .join("user_units as uu", (j) => {
      j.on("uu.user_id", "=", "c.user_id").andOn("uu.unit_id", "=", "c.unit_id");
    })
    .whereIn("c.unit_id", unitIds)
    .where({ "u.role": "physician", "u.active": true })
    .orderBy("u.name")
    .select("c.unit_id", "u.id", "u.name")) as { unit_id: number; id: number; name: string }[];
  for (const r of rows) byUnit.get(r.unit_id)?.push({ id: r.id, name: r.name });
  return byUnit;
}

/** Who may co-sign one order (its prescriber, and its unit's designated co-signers). */
export async function cosignersFor(
  knex: Knex | Knex.Transaction,
  order: { unitId: number; prescriber: Person },
): Promise<Cosigners> {
  const designated = (await unitCosigners(knex, [order.unitId])).get(order.unitId) ?? [];
  return { prescriber: order.prescriber, designated };
}
