/**
 * Engine benchmark: calls per second of forecastFio2Change and proposeStep.
 * Run with `npx tsx tests/bench/engine.ts`. Not a test (no .test.ts suffix).
 * Each function is warmed up, then timed over several rounds; the median round
 * is reported, with the fastest and slowest beside it.
 */
import {
  ardsNetworkTable,
  forecastFio2Change,
  proposeStep,
  type ForecastInput,
  type ProposeStepInput,
} from "../../lib/oxygen/index";

const WARM_UP_MS = 500;
const ROUND_MS = 400;
const ROUNDS = 9;

// A fixed, varied set of inputs (a simple LCG keeps runs comparable).
let seed = 42;
const random = () => (seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32;
const between = (min: number, max: number) => min + random() * (max - min);

const forecastInputs: ForecastInput[] = Array.from({ length: 1024 }, () => ({
  fio2: between(0.3, 0.9),
  pao2: between(45, 150),
  paco2: between(30, 60),
  hemoglobin: between(7, 16),
  barometricPressure: between(600, 770),
  nextFio2: between(0.3, 1),
}));

const lowerPeep = ardsNetworkTable("lower-peep");
const proposeInputs: ProposeStepInput[] = Array.from({ length: 1024 }, (_, index) => {
  const row = lowerPeep[Math.floor(random() * lowerPeep.length)] ?? lowerPeep[0];
  if (!row) throw new Error("empty step table");
  const fio2 = typeof row.fio2 === "number" ? row.fio2 : row.fio2[0];
  const peep = typeof row.peep === "number" ? row.peep : row.peep[0];
  return {
    order: {
      spo2Target: { lower: 88, upper: 95 },
      limits: { fio2Min: 0.3, fio2Max: 1, peepMin: 5, peepMax: 24 },
      steps: lowerPeep,
    },
    current: { fio2, peep },
    latestReading: { spo2: between(82, 99) },
    // Every fourth proposal has no blood gas and imputes from SpO2.
    latestBloodGas:
      index % 4 === 0
        ? null
        : {
            pao2: between(50, 110),
            paco2: between(35, 55),
            hemoglobin: between(8, 15),
            fio2,
            peep,
          },
  };
});

function run<T>(inputs: readonly T[], call: (input: T) => unknown, milliseconds: number): number {
  let calls = 0;
  let sink = 0;
  const start = performance.now();
  let elapsed = 0;
  while (elapsed < milliseconds) {
    for (let i = 0; i < 256; i++) {
      const result = call(inputs[calls % inputs.length] as T);
      if (result) sink++;
      calls++;
    }
    elapsed = performance.now() - start;
  }
  if (sink < 0) console.log(sink); // keeps the results observable
  return (calls / elapsed) * 1000;
}

function measure<T>(name: string, inputs: readonly T[], call: (input: T) => unknown): void {
  run(inputs, call, WARM_UP_MS);
  const rounds = Array.from({ length: ROUNDS }, () => run(inputs, call, ROUND_MS)).sort(
    (a, b) => a - b,
  );
  const median = rounds[Math.floor(ROUNDS / 2)] ?? 0;
  const format = (value: number) => Math.round(value).toLocaleString("en-GB");
  console.log(
    `${name.padEnd(20)} median ${format(median).padStart(11)} calls/s   (min ${format(rounds[0] ?? 0)}, max ${format(rounds[ROUNDS - 1] ?? 0)}, ${ROUNDS} rounds of ${ROUND_MS} ms)`,
  );
}

console.log(`command: npx tsx tests/bench/engine.ts`);
console.log(`node ${process.version} (${process.platform} ${process.arch})`);
measure("forecastFio2Change", forecastInputs, forecastFio2Change);
measure("proposeStep", proposeInputs, proposeStep);
