import { searchPatientsOperation } from "@/lib/admissions/operations";
import { readRoute } from "@/lib/boundary/next";

export const GET = readRoute(searchPatientsOperation, { respond: (patients) => ({ patients }) });
