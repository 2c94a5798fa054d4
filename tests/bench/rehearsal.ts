import { runRehearsal } from "../../lib/rehearsal";

/**
 * Rehearsal speed: a cohort × 72 h at 1 Hz under the three care models, in one
 * process. PATIENTS sets the cohort (default 10); the aim is 100 patients in
 * under 30 s.
 */
const patients = Number(process.env.PATIENTS ?? 10);
const hours = 72;
const started = performance.now();
const run = runRehearsal({ seed: 1, patients, hours });
const seconds = (performance.now() - started) / 1000;
const heapMb = process.memoryUsage().heapUsed / 1048576;
console.log(
  `${patients} patients × ${hours} h × ${run.models.length} care models: ${seconds.toFixed(1)} s, heap ${heapMb.toFixed(0)} MB`,
);
for (const m of run.models)
  console.log(
    `${m.model}: median time in band ${(100 * m.medianInBand).toFixed(1)} %, pooled ${(100 * m.inBand).toFixed(1)} %, ` +
      `below ${(100 * m.below).toFixed(1)} %, above ${(100 * m.above).toFixed(1)} %, unknown ${(100 * m.unknown).toFixed(1)} %, ` +
      `<88 % ${m.below88HoursPerDay.toFixed(2)} h/day, FiO2-h ${m.fio2HoursPerDay.toFixed(1)}/day, ` +
      `adjustments ${m.adjustmentsPerDay.toFixed(1)}/day, alerts ${m.alertsPerDay.toFixed(1)}/day`,
  );
