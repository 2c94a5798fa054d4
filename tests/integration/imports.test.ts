import { confirmImportOperation, previewUpload } from "@/lib/imports/operations";
import { writeOrderOperation } from "@/lib/orders/operations";
import { createHash, randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/lib/db";
import { ConflictError, DomainError, ForbiddenError } from "@/lib/errors";
import { getImportPreview, importReportCsv } from "@/lib/imports/queries";
import { remapImport, type UploadInput } from "@/lib/imports/service";
import { verifyLedger } from "@/lib/ledger/verify";
import { actorByEmail, admitTestPatient, appDb, SEEDED } from "../helpers/db";
import { hfncOrder } from "../helpers/orders";

afterAll(async () => {
  await closeDb();
});

// Fixture times are fixed (20 Nov 2026); the services take the clock, and each
// test patient's admission is moved to the day before so the rows fall inside it.
const NOW = new Date("2026-11-20T12:00:00Z");
const ADMITTED = new Date("2026-11-19T00:00:00Z");

async function patientOnHfnc(unit: "MICU" | "RESP" = "MICU") {
  const p = await admitTestPatient(unit);
  const physician = await actorByEmail(SEEDED.physician);
  await writeOrderOperation.invoke(
    appDb(),
    physician,
    hfncOrder(p.patientId, { initialFio2: 0.45, rationale: "Imported results test" }),
  );
  await appDb()("admissions")
    .where({ patient_id: p.patientId })
    .whereNull("discharged_at")
    .update({ admitted_at: ADMITTED });
  const { mrn } = (await appDb()("patients").where({ id: p.patientId }).first("mrn")) as {
    mrn: string;
  };
  const { label } = (await appDb()("beds").where({ id: p.bedId }).first("label")) as {
    label: string;
  };
  return { ...p, mrn, bed: label };
}

/** A fixture with its placeholders filled, so every run has its own patients and message ids. */
function fixture(name: string, values: Record<string, string>): Buffer {
  let text = readFileSync(new URL(`../fixtures/imports/${name}`, import.meta.url), "utf8");
  for (const [k, v] of Object.entries(values)) text = text.replaceAll(`{{${k}}}`, v);
  return Buffer.from(text, "utf8");
}

const unknownMrn = () => `ZZ${randomUUID().slice(0, 8)}`;

async function count(table: string, where: Record<string, unknown>): Promise<number> {
  const row = (await appDb()(table).where(where).count({ n: "*" }).first()) as { n: number };
  return Number(row.n);
}

function upload(
  kind: UploadInput["kind"],
  unitId: number,
  fileName: string,
  extra: Partial<UploadInput> = {},
) {
  return { kind, unitId, fileName, ...extra } as UploadInput;
}

describe("blood gas CSV", () => {
  it("previews, then imports on confirm with the engine's indices, the file kept with its hash and one ledger row per patient", async () => {
    const a = await patientOnHfnc();
    const b = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const file = fixture("blood-gas-valid.csv", { MRN: a.mrn, MRN2: b.mrn });
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", a.unitId, "gases.csv"),
      file,
      NOW,
    );
    expect(preview).toMatchObject({
      status: "previewed",
      counts: { total: 3, accepted: 3, rejected: 0 },
    });
    expect(preview.mapping?.columns).toMatchObject({
      mrn: "MRN",
      pao2: "PaO2 (mmHg)",
      fio2: "FiO2",
    });
    expect(preview.sample[0]?.summary).toContain("PaO2 68 mmHg");
    // Nothing is written before the confirm.
    expect(await count("blood_gases", { patient_id: a.patientId })).toBe(0);

    const done = await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 3 },
      NOW,
    );
    expect(done).toMatchObject({
      status: "imported",
      alreadyImported: false,
      counts: { accepted: 3 },
    });
    const gases = (await appDb()("blood_gases")
      .where({ patient_id: a.patientId })
      .orderBy("sampled_at")
      .select("pao2_mmhg", "fio2", "device", "pf_ratio", "import_id", "recorded_by")) as {
      pao2_mmhg: number;
      fio2: number;
      device: string;
      pf_ratio: number;
      import_id: number;
      recorded_by: number;
    }[];
    // First row gives FiO2 0.40; the second has none and takes the bedside setting (0.45 on HFNC).
    expect(gases).toEqual([
      {
        pao2_mmhg: 68,
        fio2: 0.4,
        device: "hfnc",
        pf_ratio: 170,
        import_id: preview.id,
        recorded_by: therapist.id,
      },
      {
        pao2_mmhg: 81,
        fio2: 0.45,
        device: "hfnc",
        pf_ratio: 180,
        import_id: preview.id,
        recorded_by: therapist.id,
      },
    ]);
    const venous = (await appDb()("blood_gases")
      .where({ patient_id: b.patientId })
      .first("sample_type", "pf_ratio")) as {
      sample_type: string;
      pf_ratio: number | null;
    };
    expect(venous).toEqual({ sample_type: "venous", pf_ratio: null });

    const stored = (await appDb()("imports")
      .where({ id: preview.id })
      .first("original_content", "content_sha256")) as {
      original_content: Buffer;
      content_sha256: string;
    };
    expect(stored.original_content.equals(file)).toBe(true);
    expect(stored.content_sha256).toMatch(/^[0-9a-f]{64}$/);
    const ledger = (await appDb()("ledger_entries")
      .where({ entity_type: "import", entity_id: String(preview.id) })
      .whereIn("patient_id", [a.patientId, b.patientId])
      .orderBy("patient_id")
      .select("action", "patient_id", "actor_user_id", "after_json")) as {
      action: string;
      patient_id: number;
      actor_user_id: number;
      after_json: string;
    }[];
    expect(ledger.map((l) => [l.action, l.patient_id, l.actor_user_id])).toEqual([
      ["import.blood_gas_csv", a.patientId, therapist.id],
      ["import.blood_gas_csv", b.patientId, therapist.id],
    ]);
    expect(
      (JSON.parse(ledger[0]!.after_json) as { bloodGasIds: number[] }).bloodGasIds,
    ).toHaveLength(2);
    expect((await verifyLedger(appDb())).ok).toBe(true);
  });

  it("gives every bad row a reason naming the field — kPa in a mmHg column, out of range, duplicate, unknown MRN, missing, bad time — and imports only the good rows", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const stranger = unknownMrn();
    const file = fixture("blood-gas-bad-rows.csv", { MRN: p.mrn, UNKNOWN: stranger });
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "mixed.csv"),
      file,
      NOW,
    );
    expect(preview.counts).toEqual({ total: 8, accepted: 2, rejected: 6 });
    const byLine = Object.fromEntries(preview.rejected.map((r) => [r.line, r.reasons]));
    expect(byLine[3]).toEqual([
      {
        code: "unit",
        field: "pao2",
        message: "PaO2 column is labelled mmHg but 9.8 looks like kPa; check the column's unit.",
      },
      {
        code: "unit",
        field: "paco2",
        message: "PaCO2 column is labelled mmHg but 5.6 looks like kPa; check the column's unit.",
      },
    ]);
    expect(byLine[4]).toEqual([
      { code: "range", field: "paco2", message: "PaCO2 200 mmHg is outside 10–150 mmHg." },
    ]);
    expect(byLine[5]).toEqual([
      { code: "duplicate", message: "Duplicate of line 2: same patient and time sampled." },
    ]);
    expect(byLine[6]).toEqual([
      {
        code: "unknown_patient",
        field: "mrn",
        message: `MRN ${stranger} is not an admitted patient on MICU.`,
      },
    ]);
    expect(byLine[7]).toEqual([{ code: "missing", field: "pao2", message: "PaO2 is missing." }]);
    expect(byLine[8]?.[0]).toMatchObject({ code: "time", field: "sampledAt" });
    expect(byLine[8]?.[0]?.message).toContain("'yesterday morning' is not a date and time");

    // Confirm imports the two good rows only; the report keeps every rejected one.
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 2 },
      NOW,
    );
    const times = (await appDb()("blood_gases")
      .where({ patient_id: p.patientId })
      .orderBy("sampled_at")
      .select("sampled_at")) as {
      sampled_at: Date;
    }[];
    expect(times.map((t) => t.sampled_at.toISOString())).toEqual([
      "2026-11-20T07:00:00.000Z",
      "2026-11-20T09:30:00.000Z",
    ]);
    const { csv, fileName } = await importReportCsv(appDb(), therapist, preview.id);
    expect(fileName).toBe(`import-${preview.id}-mixed-report.csv`);
    expect(csv).toContain(
      "line 4,4," + p.mrn + ",range,paco2,PaCO2 200 mmHg is outside 10–150 mmHg.",
    );
    expect(csv.split("\r\n").filter((l) => l.startsWith("line "))).toHaveLength(7);
  });

  it("converts kPa and g/L columns with UCUM, taking the units from the headers", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "kpa.csv"),
      fixture("blood-gas-kpa.csv", { MRN: p.mrn }),
      NOW,
    );
    expect(preview.mapping?.units).toMatchObject({
      pao2: "kPa",
      paco2: "kPa",
      hemoglobin: "g/L",
      fio2: "%",
    });
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 1 },
      NOW,
    );
    const gas = (await appDb()("blood_gases")
      .where({ patient_id: p.patientId })
      .first("pao2_mmhg", "paco2_mmhg", "hb_g_dl", "fio2")) as Record<string, number>;
    // 10.0 kPa × 7.50062 = 75.0 mmHg; 5.3 kPa = 39.8 mmHg; 118 g/L = 11.8 g/dL; 40 % = 0.40.
    expect(gas).toEqual({ pao2_mmhg: 75, paco2_mmhg: 39.8, hb_g_dl: 11.8, fio2: 0.4 });
  });

  it("lets the mapping step change a column's unit and checks the stored file again", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "kpa.csv"),
      fixture("blood-gas-kpa.csv", { MRN: p.mrn }),
      NOW,
    );
    const remapped = await remapImport(
      appDb(),
      therapist,
      preview.id,
      { ...preview.mapping, units: { ...preview.mapping?.units, pao2: "mm[Hg]" } },
      NOW,
    );
    expect(remapped.counts).toMatchObject({ accepted: 0, rejected: 1 });
    expect(remapped.rejected[0]?.reasons[0]?.message).toBe(
      "PaO2 column is labelled mmHg but 10 looks like kPa; check the column's unit.",
    );
    const incomplete = await remapImport(
      appDb(),
      therapist,
      preview.id,
      { columns: { mrn: "patient_id" }, units: {} },
      NOW,
    );
    expect(incomplete.mappingErrors?.["columns.pao2"]).toEqual([
      "Choose the column that holds PaO2.",
    ]);
  });

  it("refuses a file with the wrong delimiter, saying which one it looks like, and stores nothing", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const file = fixture("blood-gas-semicolon.csv", { MRN: p.mrn });
    const error = (await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "semi.csv"),
      file,
      NOW,
    ).catch((e: unknown) => e)) as DomainError;
    expect(error).toBeInstanceOf(DomainError);
    expect(error.status).toBe(422);
    expect(error.message).toMatch(/looks separated by semicolon \(;\), not comma \(,\)/);
    const sha = createHash("sha256").update(file).digest("hex");
    expect(await count("imports", { content_sha256: sha })).toBe(0);
    // With the delimiter chosen, the same file reads.
    const ok = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "semi.csv", { delimiter: ";" }),
      file,
      NOW,
    );
    expect(ok.counts).toEqual({ total: 1, accepted: 1, rejected: 0 });
  });

  it("changes nothing when the same file is uploaded and confirmed again", async () => {
    const p = await patientOnHfnc();
    const q = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const file = fixture("blood-gas-valid.csv", { MRN: p.mrn, MRN2: q.mrn });
    const first = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "a.csv"),
      file,
      NOW,
    );
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: first.id, expectedAccepted: 3 },
      NOW,
    );
    const ledgerBefore = await count("ledger_entries", {
      entity_type: "import",
      entity_id: String(first.id),
      patient_id: p.patientId,
    });
    const again = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "renamed.csv"),
      file,
      NOW,
    );
    expect(again).toMatchObject({
      id: first.id,
      status: "imported",
      alreadyImported: true,
      fileName: "a.csv",
    });
    const confirmedAgain = await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: first.id, expectedAccepted: 3 },
      NOW,
    );
    expect(confirmedAgain.alreadyImported).toBe(true);
    expect(await count("blood_gases", { patient_id: p.patientId })).toBe(2);
    expect(ledgerBefore).toBe(1);
    expect(
      await count("ledger_entries", {
        entity_type: "import",
        entity_id: String(first.id),
        patient_id: p.patientId,
      }),
    ).toBe(ledgerBefore);
  });

  it("refuses a stale confirm without writing anything, and refuses roles that do not upload", async () => {
    const p = await patientOnHfnc();
    const q = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("blood_gas_csv", p.unitId, "stale.csv"),
      fixture("blood-gas-valid.csv", { MRN: p.mrn, MRN2: q.mrn }),
      NOW,
    );
    // One patient is discharged between preview and confirm: the preview no longer holds.
    await appDb()("admissions").where({ patient_id: q.patientId }).update({ discharged_at: NOW });
    await expect(
      confirmImportOperation.invoke(
        appDb(),
        therapist,
        { importId: preview.id, expectedAccepted: 3 },
        NOW,
      ),
    ).rejects.toBeInstanceOf(ConflictError);
    expect(await count("blood_gases", { patient_id: p.patientId })).toBe(0);
    expect((await getImportPreview(appDb(), therapist, preview.id)).status).toBe("previewed");
    const nurse = await actorByEmail(SEEDED.nurse);
    await expect(
      previewUpload(
        appDb(),
        nurse,
        upload("blood_gas_csv", p.unitId, "x.csv"),
        Buffer.from("a"),
        NOW,
      ),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("HL7 v2 ORU^R01", () => {
  it("imports a message's gas with UCUM conversions and its SpO2 as a reading, ignoring unused codes in the notes", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const msgId = `T${randomUUID().slice(0, 12)}`;
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("hl7", p.unitId, "result.hl7"),
      fixture("hl7-valid.hl7", { MRN: p.mrn, MSGID: msgId }),
      NOW,
    );
    expect(preview.counts).toEqual({ total: 2, accepted: 2, rejected: 0 });
    expect(preview.notes).toEqual([expect.stringContaining("33437-0")]);
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 2 },
      NOW,
    );
    const gas = (await appDb()("blood_gases")
      .where({ patient_id: p.patientId })
      .first(
        "pao2_mmhg",
        "paco2_mmhg",
        "hb_g_dl",
        "fio2",
        "ph",
        "sao2_pct",
        "hco3_mmol_l",
        "base_excess_mmol_l",
      )) as Record<string, number>;
    // 9.5 kPa = 71.3 mmHg; 5.6 kPa = 42.0 mmHg; 121 g/L = 12.1 g/dL; FiO2 40 % = 0.40.
    expect(gas).toEqual({
      pao2_mmhg: 71.3,
      paco2_mmhg: 42,
      hb_g_dl: 12.1,
      fio2: 0.4,
      ph: 7.37,
      sao2_pct: 93,
      hco3_mmol_l: 24,
      base_excess_mmol_l: -1,
    });
    const reading = (await appDb()("readings")
      .where({ patient_id: p.patientId, import_id: preview.id })
      .first("spo2_pct", "source", "taken_at")) as {
      spo2_pct: number;
      source: string;
      taken_at: Date;
    };
    expect(reading).toEqual({
      spo2_pct: 94,
      source: "monitor",
      taken_at: new Date("2026-11-20T08:01:00Z"),
    });
    const stored = (await appDb()("imports")
      .where({ id: preview.id })
      .first("source_message_id")) as { source_message_id: string };
    expect(stored.source_message_id).toBe(`GASLAB|KESTREL|${msgId}`);
  });

  it("refuses a truncated message as a whole, naming the segment, and stores nothing", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const msgId = `T${randomUUID().slice(0, 12)}`;
    const error = (await previewUpload(
      appDb(),
      therapist,
      upload("hl7", p.unitId, "cut.hl7"),
      fixture("hl7-truncated.hl7", { MRN: p.mrn, MSGID: msgId }),
      NOW,
    ).catch((e: unknown) => e)) as DomainError;
    expect(error.status).toBe(422);
    expect(error.message).toBe(
      "The message is truncated or incomplete: OBX (segment 6) ends after field 5; an OBX needs OBX-2 value type, OBX-3 code, OBX-5 value and OBX-11 result status. Nothing was imported.",
    );
    expect(await count("imports", { source_message_id: `GASLAB|KESTREL|${msgId}` })).toBe(0);
  });

  it("lists each bad OBR with its reason: kPa-looking mmHg, preliminary status, out of range", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("hl7", p.unitId, "bad.hl7"),
      fixture("hl7-bad-rows.hl7", { MRN: p.mrn, MSGID: `T${randomUUID().slice(0, 12)}` }),
      NOW,
    );
    expect(preview.counts).toEqual({ total: 3, accepted: 1, rejected: 2 });
    expect(preview.rejected.map((r) => [r.label, r.reasons.map((x) => x.message)])).toEqual([
      ["OBR 2", ["PaO2 column is labelled mmHg but 9.1 looks like kPa; check the column's unit."]],
      [
        "OBR 3",
        [
          "OBX 1 (segment 10, PaCO2) has result status 'P'; only final (F) or corrected (C) results are imported.",
          "PaO2 720 mmHg is outside 10–700 mmHg.",
        ],
      ],
    ]);
  });
});

describe("monitor CSV", () => {
  it("imports a monitor series with the bedside device and FiO2, source monitor", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("monitor_csv", p.unitId, "bed.csv", { mrn: p.mrn, bed: p.bed }),
      fixture("monitor-valid.csv", {}),
      NOW,
    );
    expect(preview).toMatchObject({
      counts: { total: 6, accepted: 6, rejected: 0 },
      monitor: { mrn: p.mrn, bed: p.bed },
    });
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 6 },
      NOW,
    );
    const rows = (await appDb()("readings")
      .where({ patient_id: p.patientId })
      .orderBy("taken_at")
      .select(
        "admission_id",
        "taken_at",
        "spo2_pct",
        "respiratory_rate_per_min",
        "pulse_rate_per_min",
        "device",
        "fio2",
        "fio2_estimated",
        "flow_l_min",
        "source",
        "recorded_by",
        "import_id",
      )) as Record<string, unknown>[];
    expect(rows).toHaveLength(6);
    const { id: admissionId } = (await appDb()("admissions")
      .where({ patient_id: p.patientId })
      .first("id")) as { id: number };
    expect(rows[0]).toEqual({
      admission_id: admissionId,
      taken_at: new Date("2026-11-20T08:00:00Z"),
      spo2_pct: 95,
      respiratory_rate_per_min: null,
      pulse_rate_per_min: 88,
      device: "hfnc",
      fio2: 0.45,
      fio2_estimated: 0,
      flow_l_min: 40,
      source: "monitor",
      recorded_by: therapist.id,
      import_id: preview.id,
    });
    expect(rows.map((r) => (r.taken_at as Date).toISOString())).toEqual(
      [0, 1, 2, 3, 4, 5].map((s) => `2026-11-20T08:00:0${s}.000Z`),
    );
    expect(rows[3]?.pulse_rate_per_min).toBeNull();
    const ledger = (await appDb()("ledger_entries")
      .where({ entity_type: "import", entity_id: String(preview.id), patient_id: p.patientId })
      .select("action", "after_json")) as { action: string; after_json: string }[];
    expect(ledger).toHaveLength(1);
    expect(JSON.parse(ledger[0]!.after_json)).toMatchObject({
      readings: 6,
      from: "2026-11-20T08:00:00.000Z",
      to: "2026-11-20T08:00:05.000Z",
    });
  });

  it("feeds imported monitor readings to alert detection: a 30 s dip pages nobody, a 90 s one opens an alert", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const start = Date.parse("2026-11-20T09:00:00Z");
    // 1 Hz: 60 s in band, a 30 s dip to 89 % (3 points under the band: routine
    // depth, so no urgent fast path), 60 s in band, then 90 s at 89 %.
    const values = [
      ...Array<number>(60).fill(94),
      ...Array<number>(30).fill(89),
      ...Array<number>(60).fill(94),
      ...Array<number>(90).fill(89),
    ];
    const csv = [
      "time,spo2",
      ...values.map((v, i) => `${new Date(start + i * 1000).toISOString()},${v}`),
    ].join("\n");
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("monitor_csv", p.unitId, "dips.csv", { mrn: p.mrn, bed: p.bed }),
      Buffer.from(csv, "utf8"),
      NOW,
    );
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: values.length },
      NOW,
    );
    const alerts = (await appDb()("alerts")
      .where({ patient_id: p.patientId })
      .select("kind", "state", "started_at", "trigger_spo2_pct")) as Record<string, unknown>[];
    expect(alerts).toEqual([
      {
        kind: "below_band",
        state: "opened",
        started_at: new Date(start + 150_000),
        trigger_spo2_pct: 89,
      },
    ]);
  });

  it("lists bad monitor rows — out of range, missing, fraction in %, bad pulse, duplicate time, future — and an overlapping file's stored times as duplicates", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const preview = await previewUpload(
      appDb(),
      therapist,
      upload("monitor_csv", p.unitId, "bad.csv", { mrn: p.mrn, bed: p.bed }),
      fixture("monitor-bad-rows.csv", {}),
      NOW,
    );
    expect(preview.counts).toEqual({ total: 9, accepted: 3, rejected: 6 });
    expect(
      preview.rejected.map((r) => [r.line, r.reasons[0]?.code, r.reasons[0]?.message]),
    ).toEqual([
      [3, "range", "SpO2 140 % is outside 0–100 %."],
      [5, "missing", "SpO2 is missing."],
      [
        6,
        "unit",
        "SpO2 column is labelled % but 0.95 looks like a fraction (0–1); check the column's unit.",
      ],
      [7, "format", "Pulse rate 'abc' is not a whole number."],
      [
        9,
        "duplicate",
        "Duplicate time 2026-11-20T09:00:05.000Z: an earlier row has the same time.",
      ],
      [10, "time", "Time 2027-01-01T00:00:00Z is in the future."],
    ]);
    await confirmImportOperation.invoke(
      appDb(),
      therapist,
      { importId: preview.id, expectedAccepted: 3 },
      NOW,
    );
    // A second file overlapping the first: its rows at stored times are duplicates.
    const overlap = Buffer.from("time,spo2\n2026-11-20T09:00:00Z,96\n2026-11-20T09:00:06Z,95\n");
    const second = await previewUpload(
      appDb(),
      therapist,
      upload("monitor_csv", p.unitId, "overlap.csv", { mrn: p.mrn, bed: p.bed }),
      overlap,
      NOW,
    );
    expect(second.counts).toEqual({ total: 2, accepted: 1, rejected: 1 });
    expect(second.rejected[0]?.reasons[0]?.code).toBe("duplicate");
  });

  it("refuses a semicolon file, a wrong bed and an unknown MRN as a whole, with the reason", async () => {
    const p = await patientOnHfnc();
    const therapist = await actorByEmail(SEEDED.therapist);
    const attempt = (file: Buffer, mrn: string, bed: string) =>
      previewUpload(
        appDb(),
        therapist,
        upload("monitor_csv", p.unitId, "m.csv", { mrn, bed }),
        file,
        NOW,
      ).then(
        () => new DomainError("was accepted", 400),
        (e: unknown) => e as DomainError,
      );
    const semi = await attempt(fixture("monitor-semicolon.csv", {}), p.mrn, p.bed);
    expect(semi.message).toMatch(/looks separated by semicolon/);
    const bed = await attempt(fixture("monitor-valid.csv", {}), p.mrn, "NOPE");
    expect(bed.message).toBe(
      `MRN ${p.mrn} is admitted on MICU bed ${p.bed}, not bed NOPE; check which monitor the file came from.`,
    );
    const stranger = unknownMrn();
    const unknown = await attempt(fixture("monitor-valid.csv", {}), stranger, p.bed);
    expect(unknown.message).toBe(
      `MRN ${stranger} is not an admitted patient on MICU; no row of the file was imported.`,
    );
    expect(await count("readings", { patient_id: p.patientId })).toBe(0);
  });
});
