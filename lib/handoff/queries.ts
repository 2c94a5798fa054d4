import type { Knex } from "knex";
import { ageInYears } from "../admissions/display";
import { listAlerts, type AlertView } from "../alerts/queries";
import type { Actor } from "../auth/actor";
import { assertUnitAccess } from "../auth/actor-queries";
import {
  getBedsideContext,
  type BedsideSettings,
  type LatestBloodGasView,
  type LatestReadingView,
} from "../chart/bedside";
import { DEVICE_PROFILES } from "../devices";
import { NotFoundError } from "../errors";
import type { OrderView } from "../orders/queries";
import { timeInBandFromRollups } from "../rollups/time-in-band";
import { getUnit, listBeds, type UnitDetail } from "../units/queries";
import type { Shift } from "../units/shifts";
import { lateHandover, outgoingWindow, resolveHandover, type HandoverChoice } from "./handover";

export type Person = { id: number; name: string };
export type CareTeam = { nurse: Person | null; therapist: Person | null; physician: Person | null };
export type ShiftView = { startsAt: string; endsAt: string };

export type HandoffAcknowledgement = { userId: number; name: string; acknowledgedAt: string };

export type HandoffBed = {
  bedId: number;
  bedLabel: string;
  admissionId: number;
  patient: { id: number; name: string; mrn: string; age: number };
  /** The order in effect (active or awaiting co-signature). */
  order: {
    id: number;
    status: OrderView["status"];
    device: OrderView["device"];
    deviceLabel: string;
    spo2Band: OrderView["spo2Band"];
    limits: OrderView["limits"];
    reassessMinutes: number;
  } | null;
  /** What is applied at the bedside now. */
  settings: (BedsideSettings & { deviceLabel: string }) | null;
  latestReading: LatestReadingView | null;
  latestBloodGas: LatestBloodGasView | null;
  openAlerts: Pick<AlertView, "id" | "kind" | "grade" | "state" | "openedAt">[];
  /** Shares of the outgoing shift so far (lib/time-in-band, as the Board's 24 h). */
  timeInBand: {
    from: string;
    to: string;
    below: number;
    inBand: number;
    above: number;
    unknown: number;
  };
  outgoingTeam: CareTeam;
  incomingTeam: CareTeam;
  /** Everyone who acknowledged this bed's handoff for the incoming shift. */
  acknowledgements: HandoffAcknowledgement[];
  /** Whether the nurse assigned to the incoming shift has acknowledged. */
  incomingNurseAcknowledged: boolean;
};

export type HandoffView = {
  unit: Pick<UnitDetail, "id" | "code" | "name" | "timeZone" | "shiftStart" | "shiftHours">;
  outgoing: ShiftView;
  incoming: ShiftView;
  /** The handover to the shift that has just started, while it is in its first hour. */
  lateIncoming: ShiftView | null;
  now: string;
  beds: HandoffBed[];
};

const shiftView = (s: Shift): ShiftView => ({
  startsAt: s.startsAt.toISOString(),
  endsAt: s.endsAt.toISOString(),
});

/** An active unit the actor belongs to; anything else answers 404. */
export async function readableUnit(knex: Knex, actor: Actor, unitId: number): Promise<UnitDetail> {
  assertUnitAccess(actor, unitId);
  const unit = await getUnit(knex, unitId);
  if (!unit || !unit.active) throw new NotFoundError();
  return unit;
}

type AssignmentRow = {
  bed_id: number;
  duty: keyof CareTeam;
  user_id: number;
  name: string;
  starts_at: Date;
  ends_at: Date;
};

/** Who is assigned to each duty of a bed for a shift: the assignment in effect at its start, else the first overlapping it. */
function teamOf(rows: AssignmentRow[], bedId: number, shift: Shift): CareTeam {
  const pick = (duty: keyof CareTeam): Person | null => {
    const overlapping = rows.filter(
      (r) =>
        r.bed_id === bedId &&
        r.duty === duty &&
        r.starts_at < shift.endsAt &&
        r.ends_at > shift.startsAt,
    );
    const atStart = overlapping.find((r) => r.starts_at <= shift.startsAt);
    const row = atStart ?? overlapping[0];
    return row ? { id: row.user_id, name: row.name } : null;
  };
  return { nurse: pick("nurse"), therapist: pick("therapist"), physician: pick("physician") };
}

/**
 * The handoff of a unit for one handover: every occupied active bed with its
 * patient, order, applied settings, latest values, open alerts, the outgoing
 * shift's time in band, both shifts' teams and the acknowledgements so far.
 */
export async function loadHandoff(
  knex: Knex,
  actor: Actor,
  input: { unitId: number; shift: HandoverChoice },
  now: Date = new Date(),
): Promise<HandoffView> {
  const unit = await readableUnit(knex, actor, input.unitId);
  const handover = resolveHandover(unit, input.shift, now);
  const late = lateHandover(unit, now);
  const window = outgoingWindow(handover, now);
  const occupied = (await listBeds(knex, unit.id)).filter((b) => b.occupant !== null);
  const admissionIds = occupied.map((b) => b.occupant!.admissionId);
  const bedIds = occupied.map((b) => b.id);

  const [contexts, patients, assignments, acks, alerts, tibs] = await Promise.all([
    Promise.all(
      occupied.map((b) => getBedsideContext(knex, actor, b.occupant!.patientId, { now })),
    ),
    admissionIds.length
      ? (knex("patients as p")
          .join("admissions as a", "a.patient_id", "p.id")
          .whereIn("a.id", admissionIds)
          .select("a.id as admission_id", "p.birth_date") as Promise<
          { admission_id: number; birth_date: Date }[]
        >)
      : Promise.resolve([]),
    bedIds.length
      ? (knex("care_assignments as c")
          .join("users as u", "u.id", "c.user_id")
          .whereIn("c.bed_id", bedIds)
          .where("c.starts_at", "<", handover.incoming.endsAt)
          .where("c.ends_at", ">", handover.outgoing.startsAt)
          .orderBy("c.starts_at")
          .select(
            "c.bed_id",
            "c.duty",
            "c.user_id",
            "u.name",
            "c.starts_at",
            "c.ends_at",
          ) as Promise<AssignmentRow[]>)
      : Promise.resolve([]),
    admissionIds.length
      ? (knex("handoff_acknowledgements as h")
          .join("users as u", "u.id", "h.user_id")
          .whereIn("h.admission_id", admissionIds)
          .where("h.shift_starts_at", handover.incoming.startsAt)
          .orderBy("h.acknowledged_at")
          .select("h.admission_id", "h.user_id", "u.name", "h.acknowledged_at") as Promise<
          { admission_id: number; user_id: number; name: string; acknowledged_at: Date }[]
        >)
      : Promise.resolve([]),
    admissionIds.length
      ? listAlerts(knex, actor, { status: "open", unitId: unit.id, limit: 200 })
      : Promise.resolve([]),
    timeInBandFromRollups(knex, admissionIds, window.from, window.to),
  ]);

  const birth = new Map(patients.map((p) => [p.admission_id, p.birth_date]));
  const beds = occupied.map((bed, i): HandoffBed => {
    const occupant = bed.occupant!;
    const ctx = contexts[i]!;
    const order = ctx.order;
    const tib = tibs.get(occupant.admissionId)!;
    const incomingTeam = teamOf(assignments, bed.id, handover.incoming);
    const acknowledgements = acks
      .filter((a) => a.admission_id === occupant.admissionId)
      .map((a) => ({
        userId: a.user_id,
        name: a.name,
        acknowledgedAt: a.acknowledged_at.toISOString(),
      }));
    return {
      bedId: bed.id,
      bedLabel: bed.label,
      admissionId: occupant.admissionId,
      patient: {
        id: occupant.patientId,
        name: occupant.name,
        mrn: occupant.mrn,
        age: ageInYears(birth.get(occupant.admissionId)!, now),
      },
      order: order
        ? {
            id: order.id,
            status: order.status,
            device: order.device,
            deviceLabel: DEVICE_PROFILES[order.device].label,
            spo2Band: order.spo2Band,
            limits: order.limits,
            reassessMinutes: order.reassessMinutes,
          }
        : null,
      settings: ctx.settings
        ? { ...ctx.settings, deviceLabel: DEVICE_PROFILES[ctx.settings.device].label }
        : null,
      latestReading: ctx.latestReading,
      latestBloodGas: ctx.latestBloodGas,
      openAlerts: alerts
        .filter((a) => a.patient.id === occupant.patientId)
        .map((a) => ({
          id: a.id,
          kind: a.kind,
          grade: a.grade,
          state: a.state,
          openedAt: a.openedAt,
        })),
      timeInBand: {
        from: window.from.toISOString(),
        to: window.to.toISOString(),
        below: tib.below,
        inBand: tib.inBand,
        above: tib.above,
        unknown: tib.unknown,
      },
      outgoingTeam: teamOf(assignments, bed.id, handover.outgoing),
      incomingTeam,
      acknowledgements,
      incomingNurseAcknowledged:
        incomingTeam.nurse !== null &&
        acknowledgements.some((a) => a.userId === incomingTeam.nurse!.id),
    };
  });

  return {
    unit: {
      id: unit.id,
      code: unit.code,
      name: unit.name,
      timeZone: unit.timeZone,
      shiftStart: unit.shiftStart,
      shiftHours: unit.shiftHours,
    },
    outgoing: shiftView(handover.outgoing),
    incoming: shiftView(handover.incoming),
    lateIncoming:
      late && late.incoming.startsAt.getTime() !== handover.incoming.startsAt.getTime()
        ? shiftView(late.incoming)
        : null,
    now: now.toISOString(),
    beds,
  };
}
