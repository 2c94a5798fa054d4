/**
 * Alert detection benchmark: a 7-day, 1 Hz SpO2 series (604,800 readings)
 * through detectExcursions — the same step function the service runs on each
 * charted or imported reading. Run with `npm run bench:alerts`. Not a test.
 * The series is invented: a slow drift around 94 % with monitor noise, dips
 * of a few seconds (artefacts) and some sustained excursions, so every branch
 * of the detector is exercised. The median of several rounds is reported.
 */
import type { DetectReading } from "../../lib/alerts/detect";
import { detectExcursions } from "../../lib/alerts/replay";

const SECONDS = 7 * 24 * 3600;
const ROUNDS = 7;

let seed = 7;
const random = () => (seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32;

function series(): DetectReading[] {
  const out: DetectReading[] = [];
  const start = Date.UTC(2026, 10, 20);
  let base = 94;
  let dipLeft = 0;
  let dipDepth = 0;
  for (let i = 0; i < SECONDS; i++) {
    base += (random() - 0.5) * 0.02;
    base = Math.min(97, Math.max(90, base));
    if (dipLeft === 0 && random() < 0.0005) {
      // Mostly short artefacts, sometimes a real desaturation of minutes.
      dipLeft = random() < 0.8 ? 5 + Math.floor(random() * 20) : 120 + Math.floor(random() * 900);
      dipDepth = 4 + random() * 10;
    }
    const dip = dipLeft > 0 ? dipDepth : 0;
    if (dipLeft > 0) dipLeft--;
    const spo2 = Math.round(base - dip + (random() - 0.5) * 2);
    out.push({ t: start + i * 1000, spo2, fio2: 0.4, flow: null, source: "monitor" });
  }
  return out;
}

const readings = series();
const band = { lower: 92, upper: 96 };
detectExcursions(readings, band); // warm-up
const times: number[] = [];
let count = 0;
for (let round = 0; round < ROUNDS; round++) {
  const t0 = process.hrtime.bigint();
  count = detectExcursions(readings, band).excursions.length;
  times.push(Number(process.hrtime.bigint() - t0) / 1e6);
}
times.sort((a, b) => a - b);
console.log(
  `detectExcursions over ${readings.length.toLocaleString("en")} readings (7 days at 1 Hz): ` +
    `median ${times[Math.floor(ROUNDS / 2)]!.toFixed(1)} ms (min ${times[0]!.toFixed(1)}, max ${times[ROUNDS - 1]!.toFixed(1)}); ` +
    `${count} excursions opened; target < 100 ms`,
);
