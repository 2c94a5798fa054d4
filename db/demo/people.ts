import type { Role } from "../../lib/auth/roles";

/**
 * The invented staff of Kestrel Harbour Hospital. Every name is made up; the
 * README lists each sign-in. Units: MICU (12-bed medical ICU), RESP (20-bed
 * respiratory ward).
 */
export const DEMO_PASSWORD = "tidemark-demo";

export type DemoUser = { email: string; name: string; role: Role; units: ("MICU" | "RESP")[] };

export const DEMO_USERS: DemoUser[] = [
  {
    email: "ines.varga@kestrel.example",
    name: "Dr Ines Varga",
    role: "physician",
    units: ["MICU", "RESP"],
  },
  {
    email: "tobias.renwick@kestrel.example",
    name: "Dr Tobias Renwick",
    role: "physician",
    units: ["MICU"],
  },
  {
    email: "amara.obi-lund@kestrel.example",
    name: "Dr Amara Obi-Lund",
    role: "physician",
    units: ["RESP"],
  },
  {
    email: "priya.castellan@kestrel.example",
    name: "Priya Castellan",
    role: "therapist",
    units: ["MICU", "RESP"],
  },
  { email: "jonah.pell@kestrel.example", name: "Jonah Pell", role: "therapist", units: ["MICU"] },
  {
    email: "saoirse.mendez@kestrel.example",
    name: "Saoirse Mendez",
    role: "therapist",
    units: ["RESP"],
  },
  { email: "hana.whitlock@kestrel.example", name: "Hana Whitlock", role: "nurse", units: ["MICU"] },
  { email: "felix.adeyemi@kestrel.example", name: "Felix Adeyemi", role: "nurse", units: ["MICU"] },
  {
    email: "greta.sorensen@kestrel.example",
    name: "Greta Sorensen",
    role: "nurse",
    units: ["RESP"],
  },
  { email: "mateo.ruskin@kestrel.example", name: "Mateo Ruskin", role: "nurse", units: ["RESP"] },
  { email: "lior.brandt@kestrel.example", name: "Lior Brandt", role: "nurse", units: ["MICU"] },
  {
    email: "noor.halvorsen@kestrel.example",
    name: "Noor Halvorsen",
    role: "nurse",
    units: ["RESP"],
  },
  {
    email: "edith.calloway@kestrel.example",
    name: "Edith Calloway",
    role: "reviewer",
    units: ["MICU", "RESP"],
  },
  {
    email: "rafael.ostrowski@kestrel.example",
    name: "Rafael Ostrowski",
    role: "reviewer",
    units: ["RESP"],
  },
  {
    email: "wren.achterberg@kestrel.example",
    name: "Wren Achterberg",
    role: "admin",
    units: ["MICU", "RESP"],
  },
  {
    email: "kofi.marchetti@kestrel.example",
    name: "Kofi Marchetti",
    role: "admin",
    units: ["MICU", "RESP"],
  },
];

const GIVEN = [
  "Alba",
  "Bram",
  "Cosima",
  "Dario",
  "Elin",
  "Fenna",
  "Gideon",
  "Halla",
  "Ivo",
  "Juno",
  "Kasimir",
  "Leonie",
  "Mirek",
  "Nadia",
  "Orin",
  "Petra",
  "Quentin",
  "Rosalind",
  "Sven",
  "Tamsin",
  "Ulla",
  "Vito",
  "Wilhelmina",
  "Xavi",
  "Yara",
  "Zeno",
  "Adela",
  "Bastian",
];
const FAMILY = [
  "Quillfeather",
  "Marrowby",
  "Tenterden",
  "Ashcombe",
  "Vellacott",
  "Drystan",
  "Pembrook",
  "Lowenthal",
  "Fairwater",
  "Greyling",
  "Hollinshed",
  "Kettleby",
  "Ravensholt",
  "Stavely",
  "Thornquist",
  "Underhill",
  "Wexcombe",
  "Brightmoor",
  "Coldharbour",
  "Dunmere",
  "Elsworth",
  "Foxley",
  "Gallimore",
  "Harwick",
  "Ironside",
  "Jessop",
  "Kilbride",
  "Lindqvist",
];

/** Deterministic invented patients: same names and MRNs on every seed. */
export function demoPatients(count: number) {
  return Array.from({ length: count }, (_, i) => {
    const birthYear = 1938 + ((i * 17) % 62);
    const month = 1 + ((i * 5) % 12);
    const day = 1 + ((i * 11) % 28);
    const sex = i % 2 === 0 ? ("female" as const) : ("male" as const);
    return {
      mrn: `KH${String(402150 + i * 37).padStart(6, "0")}`,
      given_name: GIVEN[i % GIVEN.length]!,
      family_name: FAMILY[(i * 7) % FAMILY.length]!,
      birth_date: `${birthYear}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`,
      sex,
      height_cm: sex === "female" ? 152 + ((i * 3) % 24) : 165 + ((i * 3) % 26),
    };
  });
}
