/**
 * Speed of the respiratory and uptake model, for `npm run bench` (not a test).
 *
 * Figures (milliseconds unless named otherwise):
 * - plan2hMedianMs: breath-resolved 2-h plan of a 30 g bird (about 6,000 breaths): median of the
 *   medians of 5 batches of 100 runs; plan2hBatchMedianLowMs / HighMs show how far the batches
 *   spread on this machine
 * - plan2hMedianOf7ProcessesMs, plan2hSlowestProcessMs, plan2hProcessesOver1msCount: the same plan
 *   timed in 7 fresh processes (plan-probe.ts): the engine's optimisation of the long loop can
 *   differ from process to process (see the speed note on `simulate` and docs/model.md, section 10)
 * - plan2hBreaths: breaths simulated in that plan
 * - plan2hPhasedMedianMs (and CpuMs, Breaths): the same plan with a mask phase to 10 min, then
 *   0.5 min on room air and an endotracheal tube, timed in the same batches beside the plan
 * - uncertainty500MedianMs: 500-sample uncertainty run of the same plan, median of 15 runs
 * - analyticWashinMedianMs: one-compartment analytic wash-in of the same schedule evaluated at
 *   every breath, in batches alternating with the plan's; planToAnalyticRatio is the median of the
 *   batch-by-batch ratios
 * - analytic500MedianMs: 500 analytic runs; uncertaintyToAnalyticRatio likewise
 * - computePlanMedianMs: the whole plan assembler with its default 200 uncertainty samples
 * - band500OneWorkerMedianMs, band500PoolMedianMs: the 500-sample band with its brain curve band,
 *   as the planning screen gets it: slices run in worker threads (one, then the pool's size on
 *   this machine, bandPoolWorkers) and merged; median of 5, from sending to the merged bands
 * Each timed figure also has a ...CpuMs twin (process CPU time): on a shared machine the CPU time
 * is the steadier of the two. CPU timer resolution is coarse for the sub-millisecond runs.
 */
import { spawnSync } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { estimateRespiratory } from '../../app/core/model/allometry.js';
import {
  buildSimulationSetup,
  computePlan,
  planUncertaintyInput,
  resolveMac,
} from '../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../app/core/model/plan-types.js';
import { simulate, type ScheduleStep } from '../../app/core/model/simulation.js';
import { mergeUncertainty, runUncertainty, type UncertaintySlice } from '../../app/core/model/uncertainty.js';
import { maxPoolSize, splitSamples } from '../../app/ui/plans/band-pool.js';
import type { BandJob } from './band-worker.js';
import { agents } from '../../app/core/agents.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { twoHourBudgerigarPhasedPlan, twoHourBudgerigarPlan } from '../core/model/plan-fixtures.js';
import { median } from './figures.js';

/** Medians of the 2-h plan in `count` fresh Node processes (see plan-probe.ts). */
function planInFreshProcesses(count: number): number[] {
  const probe = fileURLToPath(new URL('./plan-probe.js', import.meta.url));
  const medians: number[] = [];
  for (let index = 0; index < count; index += 1) {
    const run = spawnSync(process.execPath, [probe], { encoding: 'utf8' });
    if (run.status !== 0) throw new Error(`plan probe failed: ${run.stderr}`);
    medians.push((JSON.parse(run.stdout) as { medianMs: number }).medianMs);
  }
  return medians;
}

// The test fixture's 2-h plan, with the default uncertainty run for the whole-plan figure.
const benchPlan: PlanInput = { ...twoHourBudgerigarPlan, uncertainty: undefined };
// The same plan as a mask induction, then 0.5 min on room air and a tube for the rest.
const phasedBenchPlan: PlanInput = { ...twoHourBudgerigarPhasedPlan, uncertainty: undefined };

/** Median wall-clock and process CPU time (user + system) of `runs` calls, in ms. */
function timeRuns(runs: number, body: () => void): { wallMs: number; cpuMs: number } {
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let run = 0; run < runs; run += 1) {
    const cpuStart = process.cpuUsage();
    const start = performance.now();
    body();
    wall.push(performance.now() - start);
    const used = process.cpuUsage(cpuStart);
    cpu.push((used.user + used.system) / 1000);
  }
  return { wallMs: median(wall), cpuMs: median(cpu) };
}

/**
 * One-compartment analytic wash-in: F(t) follows each dial step with time constant tau,
 * F = Fstep + (F0 - Fstep) e^{-(t - t0)/tau}, evaluated once per breath.
 */
function analyticWashin(
  schedule: readonly ScheduleStep[],
  tauMin: number,
  breathMin: number,
  endMin: number,
): number {
  let fraction = 0;
  let stepIndex = 0;
  let stepStart = 0;
  let startFraction = 0;
  let target = (schedule[0]?.vaporPct ?? 0) / 100;
  let peak = 0;
  for (let time = 0; time < endMin; time += breathMin) {
    const next = schedule[stepIndex + 1];
    if (next !== undefined && time >= next.atMin) {
      stepIndex += 1;
      startFraction = fraction;
      stepStart = next.atMin;
      target = next.vaporPct / 100;
    }
    fraction = target + (startFraction - target) * Math.exp(-(time - stepStart) / tauMin);
    if (fraction > peak) peak = fraction;
  }
  return peak;
}

/** Median time of the 500-sample band over one worker thread and over the pool, in ms. */
async function bandInWorkers(): Promise<{ oneWorkerMs: number; poolMs: number; workers: number }> {
  const input: PlanInput = { ...benchPlan, uncertainty: { samples: 500, seed: 1 } };
  const uncertaintyInput = planUncertaintyInput(input, { species: speciesReference });
  const size = Math.max(1, Math.min(maxPoolSize, os.availableParallelism()));
  const script = new URL('./band-worker.js', import.meta.url);
  const workers = Array.from({ length: size }, () => new Worker(script));
  const slice = (worker: Worker, job: BandJob) =>
    new Promise<UncertaintySlice>((resolve, reject) => {
      const settle = (answer: UncertaintySlice) => {
        worker.off('error', fail);
        resolve(answer);
      };
      const fail = (error: Error) => {
        worker.off('message', settle);
        reject(error);
      };
      worker.once('message', settle);
      worker.once('error', fail);
      worker.postMessage(job);
    });
  const timeBand = async (parts: number): Promise<number> => {
    const times: number[] = [];
    for (let run = 0; run < 6; run += 1) {
      const started = performance.now();
      const slices = await Promise.all(
        splitSamples(500, parts).map(([from, to], part) =>
          slice(workers[part] as Worker, { input, from, to }),
        ),
      );
      mergeUncertainty(uncertaintyInput, slices);
      // The first run warms the workers up.
      if (run > 0) times.push(performance.now() - started);
    }
    return median(times);
  };
  try {
    const oneWorkerMs = await timeBand(1);
    const poolMs = await timeBand(size);
    return { oneWorkerMs, poolMs, workers: size };
  } finally {
    await Promise.all(workers.map((worker) => worker.terminate()));
  }
}

/** Runs the model benchmark and returns its figures. */
export async function benchModel(): Promise<Record<string, number>> {
  const estimates = estimateRespiratory(benchPlan.bodyMassG);
  const mac = resolveMac(benchPlan, undefined);
  const setup = buildSimulationSetup(benchPlan, estimates, mac);
  let outcome = simulate(setup);
  for (let warm = 0; warm < 30; warm += 1) outcome = simulate(setup);
  const breathMin = 1 / estimates.breathsPerMin.value;
  const tauMin =
    (estimates.airSacVolumeMl.value + estimates.lungVolumeMl.value) / estimates.minuteVentilationMlMin.value;
  let sink = 0;
  for (let warm = 0; warm < 30; warm += 1)
    sink += analyticWashin(benchPlan.schedule, tauMin, breathMin, setup.endMin);
  // The 2-h plan and the analytic wash-in in alternating batches, so that both see the same
  // moments of this shared machine (its speed drifts by up to 2x from second to second); the
  // ratio is taken batch by batch and the spread of the batch medians is reported with them.
  // The same plan with a mask phase then a tube phase, timed in the same batches beside it.
  const phasedSetup = buildSimulationSetup(phasedBenchPlan, estimates, mac);
  let phasedOutcome = simulate(phasedSetup);
  for (let warm = 0; warm < 30; warm += 1) phasedOutcome = simulate(phasedSetup);
  const planBatches: { wallMs: number; cpuMs: number }[] = [];
  const phasedBatches: { wallMs: number; cpuMs: number }[] = [];
  const analyticBatches: { wallMs: number; cpuMs: number }[] = [];
  for (let batch = 0; batch < 5; batch += 1) {
    planBatches.push(
      timeRuns(100, () => {
        outcome = simulate(setup);
      }),
    );
    phasedBatches.push(
      timeRuns(100, () => {
        phasedOutcome = simulate(phasedSetup);
      }),
    );
    analyticBatches.push(
      timeRuns(100, () => {
        sink += analyticWashin(benchPlan.schedule, tauMin, breathMin, setup.endMin);
      }),
    );
  }
  const planBatchMs = planBatches.map((batch) => batch.wallMs);
  const plan2hMedianMs = {
    wallMs: median(planBatchMs),
    cpuMs: median(planBatches.map((batch) => batch.cpuMs)),
  };
  const analyticWashinMedianMs = { wallMs: median(analyticBatches.map((batch) => batch.wallMs)) };
  const planToAnalyticRatio = median(
    planBatches.map((batch, index) => batch.wallMs / (analyticBatches[index]?.wallMs ?? Number.NaN)),
  );
  const uncertaintyInput = {
    setup,
    outcome,
    macSdPct: null,
    samples: 500,
    seed: 1,
    bloodGasRange: agents.isoflurane.bloodGasRange,
  };
  for (let warm = 0; warm < 3; warm += 1) runUncertainty(uncertaintyInput);
  const uncertainty500MedianMs = timeRuns(15, () => {
    runUncertainty(uncertaintyInput);
  });
  // The same run as the screens use it: with the brain band over the whole timeline.
  const withBand = { ...uncertaintyInput, brainTimeline: outcome.timeline };
  runUncertainty(withBand);
  const uncertainty500WithBandMedianMs = timeRuns(7, () => {
    runUncertainty(withBand);
  });
  const analytic500MedianMs = timeRuns(15, () => {
    for (let run = 0; run < 500; run += 1)
      sink += analyticWashin(benchPlan.schedule, tauMin * (1 + run / 5000), breathMin, setup.endMin);
  });
  computePlan(benchPlan, { species: speciesReference });
  const computePlanMedianMs = timeRuns(10, () => {
    computePlan(benchPlan, { species: speciesReference });
  });
  const pool = await bandInWorkers();
  const processMedians = planInFreshProcesses(7);
  return {
    plan2hMedianMs: plan2hMedianMs.wallMs,
    plan2hMedianOf7ProcessesMs: median(processMedians),
    plan2hSlowestProcessMs: Math.max(...processMedians),
    plan2hProcessesOver1msCount: processMedians.filter((value) => value > 1).length,
    plan2hCpuMs: plan2hMedianMs.cpuMs,
    plan2hBatchMedianLowMs: Math.min(...planBatchMs),
    plan2hBatchMedianHighMs: Math.max(...planBatchMs),
    plan2hBreaths: outcome.breaths,
    plan2hPhasedMedianMs: median(phasedBatches.map((batch) => batch.wallMs)),
    plan2hPhasedCpuMs: median(phasedBatches.map((batch) => batch.cpuMs)),
    plan2hPhasedBreaths: phasedOutcome.breaths,
    uncertainty500MedianMs: uncertainty500MedianMs.wallMs,
    uncertainty500CpuMs: uncertainty500MedianMs.cpuMs,
    uncertainty500WithBandMedianMs: uncertainty500WithBandMedianMs.wallMs,
    analyticWashinMedianMs: analyticWashinMedianMs.wallMs,
    planToAnalyticRatio,
    analytic500MedianMs: analytic500MedianMs.wallMs,
    analytic500CpuMs: analytic500MedianMs.cpuMs,
    uncertaintyToAnalyticRatio: uncertainty500MedianMs.wallMs / analytic500MedianMs.wallMs,
    computePlanMedianMs: computePlanMedianMs.wallMs,
    computePlanCpuMs: computePlanMedianMs.cpuMs,
    band500OneWorkerMedianMs: pool.oneWorkerMs,
    band500PoolMedianMs: pool.poolMs,
    bandPoolWorkers: pool.workers,
    analyticChecksum: Number.isFinite(sink) ? 1 : 0,
  };
}
