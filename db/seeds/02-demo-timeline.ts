import type { Knex } from "knex";
import { recordAdjustment } from "../../lib/adjustments/service";
import { loadActor } from "../../lib/auth/actor-queries";
import type { Actor } from "../../lib/auth/actor";
import { recordBloodGas } from "../../lib/blood-gases/service";
import { DEVICE_PROFILES, estimateFio2, type Device } from "../../lib/devices";
import type { OrderInput } from "../../lib/orders/schema";
import { writeOrder } from "../../lib/orders/service";
import { po2FromSaturation } from "../../lib/oxygen";
import { chartReading } from "../../lib/readings/service";
import { adjustmentSchema, type AdjustmentInput } from "../../lib/adjustments/schema";
import { admitSchema, dischargeSchema, transferSchema } from "../../lib/admissions/schema";
import { admitPatient, dischargePatient, transferPatient } from "../../lib/admissions/service";
import { bloodGasSchema, type BloodGasInput } from "../../lib/blood-gases/schema";
import { orderInputSchema } from "../../lib/orders/schema";
import { readingSchema, type ReadingInput } from "../../lib/readings/schema";
import { stepTableCreateSchema } from "../../lib/step-tables/schema";
import { createStepTable } from "../../lib/step-tables/service";
import { parseInput } from "../../lib/validation";
import { DEMO_PASSWORD } from "../demo/people";
import { seedVentilatorCheck, ventilatorOrderFields, type VentPlan } from "../demo/ventilation";

// The seed backdates its writes, so it calls the services with a clock of its
// own; the input is parsed with each noun's schema, as the boundary would.
const seedOrder = (knex: Knex, actor: Actor, raw: OrderInput, at: Date) =>
  writeOrder(knex, actor, parseInput(orderInputSchema, raw), at);
const seedReading = (knex: Knex, actor: Actor, raw: ReadingInput, at?: Date) =>
  chartReading(knex, actor, parseInput(readingSchema, raw), at);
const seedBloodGas = (knex: Knex, actor: Actor, raw: BloodGasInput, at?: Date) =>
  recordBloodGas(knex, actor, parseInput(bloodGasSchema, raw), at);
const seedAdjustment = (knex: Knex, actor: Actor, raw: AdjustmentInput, at?: Date) =>
  recordAdjustment(knex, actor, parseInput(adjustmentSchema, raw), at);

// Invented clinical course for the demo: about two days of orders, readings,
// adjustments and blood gases, written through the same services as the app,
// so every row has its ledger entry. Deterministic, so every demo looks alike.

let state = 20261201;
const random = () => (state = (state * 1664525 + 1013904223) >>> 0) / 2 ** 32;
// The follow-up gases draw from their own stream, so the rest of the course stays as it was.
let gasState = 20261203;
const gasRandom = () => (gasState = (gasState * 1664525 + 1013904223) >>> 0) / 2 ** 32;
const round = (v: number, step: number) => Math.round(v / step) * step;
const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));

type Plan = {
  device: Device;
  band: [number, number];
  fio2: [number, number, number]; // min, start, max
  peep?: [number, number, number];
  flow?: [number, number, number];
  stepTable?: string;
  /** Invasive ventilation and NIV: mode and VT per kg of predicted body weight. */
  vent?: VentPlan;
  rationale: string;
};

const ICU_PLANS: Plan[] = [
  {
    device: "invasive",
    band: [88, 95],
    fio2: [0.3, 0.5, 0.8],
    peep: [5, 10, 16],
    stepTable: "ardsnet-lower-peep",
    rationale: "Moderate ARDS after pneumonia; protective ventilation, lower-PEEP table.",
    vent: { mode: "volume_control", vt: [4, 6, 8] },
  },
  {
    device: "invasive",
    band: [88, 95],
    fio2: [0.3, 0.6, 0.9],
    peep: [8, 12, 18],
    stepTable: "ardsnet-higher-peep",
    rationale: "Severe ARDS; higher-PEEP strategy agreed on rounds.",
    vent: { mode: "volume_control", vt: [4, 6, 8] },
  },
  {
    device: "invasive",
    band: [92, 96],
    fio2: [0.3, 0.4, 0.6],
    peep: [5, 8, 12],
    rationale: "Post-operative ventilation, weaning planned.",
    vent: { mode: "pressure_support", vt: [6, 7, 9] },
  },
  {
    device: "niv",
    band: [88, 92],
    fio2: [0.25, 0.35, 0.6],
    peep: [4, 6, 10],
    rationale: "COPD exacerbation with hypercapnia; NIV.",
    vent: { mode: "pressure_support", vt: [5, 7, 9] },
  },
  {
    device: "hfnc",
    band: [92, 96],
    fio2: [0.3, 0.45, 0.7],
    flow: [30, 50, 60],
    rationale: "Type 1 respiratory failure, viral pneumonitis.",
  },
  {
    device: "invasive",
    band: [90, 96],
    fio2: [0.3, 0.45, 0.8],
    peep: [5, 8, 14],
    stepTable: "ardsnet-lower-peep",
    rationale: "Aspiration pneumonitis; lung-protective settings.",
    vent: { mode: "volume_control", vt: [4, 6, 8] },
  },
  {
    device: "hfnc",
    band: [92, 96],
    fio2: [0.3, 0.4, 0.6],
    flow: [30, 40, 60],
    rationale: "Post-extubation support.",
  },
  {
    device: "niv",
    band: [92, 96],
    fio2: [0.3, 0.4, 0.6],
    peep: [5, 8, 12],
    rationale: "Cardiogenic pulmonary oedema; CPAP.",
    vent: { mode: "cpap", vt: [5, 7, 9] },
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.29, 0.45],
    flow: [1, 2, 6],
    rationale: "Step-down from HFNC.",
  },
  {
    device: "invasive",
    band: [92, 96],
    fio2: [0.3, 0.35, 0.6],
    peep: [5, 6, 10],
    rationale: "Airway protection after overdose; lungs healthy.",
    vent: { mode: "volume_control", vt: [6, 8, 10] },
  },
];

const WARD_PLANS: Plan[] = [
  {
    device: "nasal_cannula",
    band: [88, 92],
    fio2: [0.21, 0.25, 0.33],
    flow: [0.5, 1, 3],
    rationale: "COPD, known CO2 retainer.",
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.29, 0.45],
    flow: [1, 2, 6],
    rationale: "Community-acquired pneumonia.",
  },
  {
    device: "venturi_mask",
    band: [88, 92],
    fio2: [0.24, 0.28, 0.4],
    rationale: "COPD exacerbation; controlled oxygen.",
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.25, 0.45],
    flow: [0.5, 1, 6],
    rationale: "Pulmonary embolism, on anticoagulation.",
  },
  {
    device: "simple_mask",
    band: [94, 98],
    fio2: [0.35, 0.43, 0.55],
    flow: [5, 7, 10],
    rationale: "Post-operative hypoxaemia.",
  },
  {
    device: "hfnc",
    band: [92, 96],
    fio2: [0.3, 0.4, 0.6],
    flow: [30, 40, 60],
    rationale: "Interstitial lung disease flare.",
  },
  {
    device: "nasal_cannula",
    band: [88, 92],
    fio2: [0.21, 0.29, 0.37],
    flow: [0.5, 2, 4],
    rationale: "Obesity hypoventilation.",
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.25, 0.45],
    flow: [0.5, 1, 6],
    rationale: "Asthma, improving.",
  },
  {
    device: "venturi_mask",
    band: [88, 92],
    fio2: [0.24, 0.31, 0.4],
    rationale: "Bronchiectasis exacerbation.",
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.33, 0.45],
    flow: [1, 3, 6],
    rationale: "Influenza pneumonia.",
  },
  {
    device: "simple_mask",
    band: [92, 96],
    fio2: [0.35, 0.39, 0.55],
    flow: [5, 6, 10],
    rationale: "Pleural effusion awaiting drainage.",
  },
  {
    device: "hfnc",
    band: [92, 96],
    fio2: [0.3, 0.5, 0.7],
    flow: [30, 50, 60],
    rationale: "Pneumonia, escalated from mask.",
  },
  {
    device: "nasal_cannula",
    band: [94, 98],
    fio2: [0.21, 0.29, 0.45],
    flow: [1, 2, 6],
    rationale: "Rib fractures, splinting.",
  },
];

function orderInput(plan: Plan, patientId: number, stepTableId: number | undefined): OrderInput {
  return {
    entryMode: "written",
    password: DEMO_PASSWORD,
    patientId,
    device: plan.device,
    spo2Lower: plan.band[0],
    spo2Upper: plan.band[1],
    fio2Min: plan.fio2[0],
    fio2Max: plan.fio2[2],
    initialFio2: plan.fio2[1],
    ...(plan.peep
      ? { peepMin: plan.peep[0], initialPeep: plan.peep[1], peepMax: plan.peep[2] }
      : {}),
    ...(plan.flow
      ? { flowMin: plan.flow[0], initialFlow: plan.flow[1], flowMax: plan.flow[2] }
      : {}),
    ...(stepTableId ? { stepTableId } : {}),
    ...ventilatorOrderFields(plan.vent),
    reassessMinutes: plan.device === "invasive" || plan.device === "niv" ? 60 : 120,
    rationale: plan.rationale,
    supersedesOrderId: null,
  } as OrderInput;
}

export async function seed(knex: Knex): Promise<void> {
  const existing = (await knex("orders").count({ n: "*" }).first()) as { n: number | string };
  if (Number(existing.n) > 0) {
    console.log("[seed] orders already exist; leaving the demo timeline as it is");
    return;
  }
  const actorFor = async (email: string): Promise<Actor> => {
    const row = (await knex("users").where({ email }).first("id")) as { id: number };
    return loadActor(knex, row.id);
  };
  const staff = {
    MICU: {
      physician: await actorFor("tobias.renwick@kestrel.example"),
      nurse: await actorFor("hana.whitlock@kestrel.example"),
      therapist: await actorFor("jonah.pell@kestrel.example"),
    },
    RESP: {
      physician: await actorFor("amara.obi-lund@kestrel.example"),
      nurse: await actorFor("greta.sorensen@kestrel.example"),
      therapist: await actorFor("saoirse.mendez@kestrel.example"),
    },
  };
  // MICU's own FiO2/PEEP table (invented): FiO2 first at low PEEP, for the
  // Rehearsals page to set against the published lower-PEEP table.
  await createStepTable(
    knex,
    await actorFor("wren.achterberg@kestrel.example"),
    parseInput(stepTableCreateSchema, {
      unitId: ((await knex("units").where({ code: "MICU" }).first("id")) as { id: number }).id,
      name: "MICU conservative PEEP ladder",
      kind: "fio2_peep",
      source: "MICU's own table (invented for the demo)",
      rationale: "Unit table to rehearse against the published tables",
      rows: [
        [0.3, 5],
        [0.4, 5],
        [0.4, 8],
        [0.5, 8],
        [0.5, 10],
        [0.6, 10],
        [0.7, 10],
        [0.7, 12],
        [0.8, 12],
        [0.9, 14],
        [1, 14],
        [1, 16],
      ].map(([fio2, peep]) => ({ fio2Min: fio2, fio2Max: fio2, peepMin: peep, peepMax: peep })),
    }),
  );
  const tables = Object.fromEntries(
    ((await knex("step_tables").select("id", "code")) as { id: number; code: string }[]).map(
      (t) => [t.code, t.id],
    ),
  );
  const patients = (await knex("admissions as a")
    .join("beds as b", "b.id", "a.bed_id")
    .join("units as u", "u.id", "b.unit_id")
    .whereNull("a.discharged_at")
    .orderBy(["u.code", "b.sort_order"])
    .select("a.patient_id", "u.code")) as { patient_id: number; code: "MICU" | "RESP" }[];

  const end = Date.now() - 10 * 60_000;
  const start = end - 50 * 3600_000;
  let counts = { orders: 0, readings: 0, adjustments: 0, gases: 0, checks: 0 };

  for (const [index, p] of patients.entries()) {
    const unitPatients = patients.filter((x) => x.code === p.code);
    const position = unitPatients.indexOf(p);
    const plans = p.code === "MICU" ? ICU_PLANS : WARD_PLANS;
    const plan = plans[position];
    const team = staff[p.code];
    if (!plan) continue; // the last ward patients have no order yet (the empty state)
    const orderAt = new Date(start + index * 7 * 60_000);
    await seedOrder(
      knex,
      team.physician,
      orderInput(plan, p.patient_id, plan.stepTable ? tables[plan.stepTable] : undefined),
      orderAt,
    );
    counts.orders++;

    const profile = DEVICE_PROFILES[plan.device];
    let fio2 = plan.fio2[1];
    let flow = plan.flow?.[1];
    const peep = plan.peep?.[1];
    let version = 1;
    const mid = (plan.band[0] + plan.band[1]) / 2;
    let spo2 = mid + (random() - 0.5) * 4;
    const hb = round(9 + random() * 5, 0.1);
    let lastArterialAt = -Infinity;
    // An ICU gas of the forecast checks, from its own random stream: SaO2 about `spo2`, PaO2
    // from the curve within ±`spread`, at the FiO2 set then; entered 10 min after sampling.
    const checkGas = async (sampledAt: number, spo2: number, spread: number) => {
      lastArterialAt = sampledAt;
      const sao2 = clamp(spo2 + (gasRandom() - 0.5) * 3, 80, 99.5);
      await seedBloodGas(
        knex,
        team.therapist,
        {
          patientId: p.patient_id,
          sampledAt: new Date(sampledAt),
          sampleType: "arterial",
          ph: round(7.32 + gasRandom() * 0.1, 0.01),
          pao2: round(po2FromSaturation(sao2 / 100) * (1 - spread + gasRandom() * 2 * spread), 1),
          paco2: round(36 + gasRandom() * 14, 1),
          hemoglobin: hb,
          device: plan.device,
          fio2,
          ...(peep !== undefined ? { peep } : {}),
          ...(profile.uses.flow ? { flow } : {}),
        },
        new Date(sampledAt + 10 * 60_000),
      );
      counts.gases++;
    };
    // The reassessment of the sixth ward patient stopped five hours ago (overdue on the Board).
    const stopAt = p.code === "RESP" && position === 5 ? end - 5 * 3600_000 : end;
    for (
      let t = orderAt.getTime() + 30 * 60_000, step = 0;
      t <= stopAt;
      t += 2 * 3600_000, step++
    ) {
      const at = new Date(t);
      // A gentle random walk with a pull back to the middle of the band.
      spo2 = clamp(spo2 + (mid - spo2) * 0.3 + (random() - 0.5) * 5, 82, 100);
      // Two patients end below their band (future alerts), one ends above on oxygen.
      if (t + 2 * 3600_000 > stopAt && index % 9 === 1) spo2 = plan.band[0] - 3;
      if (t + 2 * 3600_000 > stopAt && index % 9 === 4) spo2 = Math.min(100, plan.band[1] + 2);
      const shownSpo2 = Math.round(spo2);
      const reading = await seedReading(
        knex,
        team.nurse,
        {
          patientId: p.patient_id,
          takenAt: at,
          spo2: shownSpo2,
          respiratoryRate: Math.round(16 + random() * 12),
          pulseRate: Math.round(70 + random() * 40),
          device: plan.device,
          ...(profile.uses.flow ? { flow } : {}),
          ...(profile.uses.fio2 === "set" ? { fio2 } : {}),
        },
        at,
      );
      counts.readings++;
      // A ventilator check every four hours, before any titration of this round.
      if (plan.vent && plan.peep && step % 2 === 0) {
        const vent = { device: plan.device, vent: plan.vent, peep: plan.peep[1] };
        await seedVentilatorCheck(
          knex,
          team.therapist,
          p.patient_id,
          vent,
          new Date(t + 10 * 60_000),
        );
        counts.checks++;
      }

      if (p.code === "MICU" && step % 6 === 0 && profile.uses.fio2 === "set") {
        const sao2 = clamp(shownSpo2 + (random() - 0.5) * 2, 80, 99.5);
        const pao2 = round(po2FromSaturation(sao2 / 100) * (0.95 + random() * 0.1), 1);
        await seedBloodGas(
          knex,
          team.therapist,
          {
            patientId: p.patient_id,
            sampledAt: new Date((lastArterialAt = t + 5 * 60_000)),
            sampleType: "arterial",
            ph: round(7.3 + random() * 0.12, 0.01),
            pao2,
            paco2: round(36 + random() * 14, 1),
            hco3: round(21 + random() * 6, 0.1),
            baseExcess: round(-4 + random() * 6, 0.1),
            sao2: round(sao2, 0.1),
            hemoglobin: hb,
            device: plan.device,
            fio2,
            ...(peep !== undefined ? { peep } : {}),
            ...(profile.uses.flow ? { flow } : {}),
          },
          new Date(t + 20 * 60_000),
        );
        counts.gases++;
      }

      // Titrate within the order's limits when the reading is out of band.
      const below = shownSpo2 < plan.band[0];
      const above = shownSpo2 > plan.band[1] && reading.fio2 > 0.21;
      if ((below || above) && t + 3600_000 < stopAt) {
        const direction = below ? 1 : -1;
        let nextFio2 = fio2;
        let nextFlow = flow;
        if (profile.uses.fio2 === "estimated" && plan.flow && flow !== undefined) {
          nextFlow = clamp(
            flow + direction * (plan.device === "nasal_cannula" ? 1 : 2),
            plan.flow[0],
            plan.flow[2],
          );
          nextFio2 = estimateFio2(plan.device, nextFlow) ?? fio2;
        } else {
          nextFio2 = round(clamp(fio2 + direction * 0.05, plan.fio2[0], plan.fio2[2]), 0.01);
        }
        if (nextFio2 !== fio2 || nextFlow !== flow) {
          const appliedAt = new Date(t + 15 * 60_000);
          // On the ICU a set-FiO2 change without a gas of the last 4 h gets one first,
          // so the change is recorded with its forecast.
          if (
            p.code === "MICU" &&
            profile.uses.fio2 === "set" &&
            appliedAt.getTime() - lastArterialAt > 4 * 3600_000
          ) {
            await checkGas(appliedAt.getTime() - 10 * 60_000, shownSpo2, 0.05);
          }
          await seedAdjustment(
            knex,
            profile.lowFlow ? team.nurse : team.therapist,
            {
              patientId: p.patient_id,
              settingsVersion: version,
              toFio2: nextFio2,
              ...(peep !== undefined ? { toPeep: peep } : {}),
              ...(nextFlow !== undefined ? { toFlow: nextFlow } : {}),
              reason: below ? "below_band" : "above_band",
              rationale: below
                ? `SpO2 ${shownSpo2} % below ${plan.band[0]} %`
                : `SpO2 ${shownSpo2} % above ${plan.band[1]} % on oxygen`,
              appliedAt,
            },
            appliedAt,
          );
          version++;
          fio2 = nextFio2;
          flow = nextFlow;
          spo2 += direction * 2.5;
          counts.adjustments++;
          // On the ICU, two changes in three of a set FiO2 are checked by an arterial gas
          // 30–90 min later (before the next round): the Chart's "How the forecasts did".
          if (p.code === "MICU" && profile.uses.fio2 === "set" && gasRandom() < 2 / 3) {
            await checkGas(appliedAt.getTime() + (30 + gasRandom() * 60) * 60_000, spo2, 0.1);
          }
        }
      }
    }
  }

  // One verbal order, entered by a nurse on the ward, waits for the physician's co-signature.
  const waiting = patients.filter((x) => x.code === "RESP")[WARD_PLANS.length];
  if (waiting) {
    await seedOrder(
      knex,
      staff.RESP.nurse,
      {
        ...orderInput(WARD_PLANS[1]!, waiting.patient_id, undefined),
        entryMode: "telephone",
        prescriberId: staff.RESP.physician.id,
        readBackConfirmed: true,
        rationale: "New hypoxaemia on the night round; telephone order, read back.",
      } as unknown as OrderInput,
      new Date(end - 40 * 60_000),
    );
    counts = { ...counts, orders: counts.orders + 1 };
  }
  await seedStay(knex, staff, end);
  console.log(
    `[seed] demo timeline: ${counts.orders} orders, ${counts.readings} readings, ${counts.adjustments} adjustments, ${counts.gases} blood gases, ${counts.checks} ventilator checks`,
  );
}

/**
 * One whole stay inside the demo's two days, through the same services as the
 * screens: admitted to the ICU from the emergency department, stepped down to
 * the ward the next day, discharged home this morning. The beds it used are
 * free again at the end, so the Board looks as before.
 */
async function seedStay(
  knex: Knex,
  staff: Record<"MICU" | "RESP", { physician: Actor; nurse: Actor }>,
  end: number,
): Promise<void> {
  const bed = async (label: string) =>
    ((await knex("beds").where({ label }).first("id")) as { id: number }).id;
  const admittedAt = new Date(end - 44 * 3600_000);
  const admitted = await admitPatient(
    knex,
    staff.MICU.nurse,
    parseInput(admitSchema, {
      mrn: "KH409911",
      familyName: "Vantwell",
      givenName: "Oskar",
      birthDate: "1957-08-19",
      sex: "male",
      heightCm: 178,
      weightKg: 84,
      bedId: await bed("I09"),
      rationale: "From the emergency department: community-acquired pneumonia.",
    }),
    admittedAt,
  );
  await seedOrder(
    knex,
    staff.MICU.physician,
    orderInput(WARD_PLANS[1]!, admitted.patientId, undefined),
    new Date(admittedAt.getTime() + 15 * 60_000),
  );
  // A physician of both units moves him; the order in effect goes with him.
  const both = (await knex("users").where({ email: "ines.varga@kestrel.example" }).first("id")) as {
    id: number;
  };
  await transferPatient(
    knex,
    await loadActor(knex, both.id),
    parseInput(transferSchema, {
      admissionId: admitted.admissionId,
      bedId: await bed("R08"),
      rationale: "Stable on low-flow oxygen: stepped down to the respiratory ward.",
    }),
    new Date(end - 20 * 3600_000),
  );
  await dischargePatient(
    knex,
    staff.RESP.nurse,
    parseInput(dischargeSchema, {
      admissionId: admitted.admissionId,
      disposition: "home",
      rationale: "Weaned to room air overnight.",
    }),
    new Date(end - 3 * 3600_000),
  );
}
