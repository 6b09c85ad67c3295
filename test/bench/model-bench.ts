/**
 * Speed of the respiratory and uptake model, for `npm run bench` (not a test).
 *
 * Figures (milliseconds unless named otherwise):
 * - plan2hMedianMs: breath-resolved 2-h plan of a 30 g bird (about 6,000 breaths), median of 200 runs
 * - plan2hBreaths: breaths simulated in that plan
 * - uncertainty500MedianMs: 500-sample uncertainty run of the same plan, median of 15 runs
 * - analyticWashinMedianMs: one-compartment analytic wash-in of the same schedule evaluated at
 *   every breath, median of 200 runs; planToAnalyticRatio = plan2hMedianMs / analyticWashinMedianMs
 * - analytic500MedianMs: 500 analytic runs; uncertaintyToAnalyticRatio likewise
 * - computePlanMedianMs: the whole plan assembler with its default 200 uncertainty samples
 * Each timed figure also has a ...CpuMs twin (process CPU time): on a shared machine the CPU time
 * is the steadier of the two. CPU timer resolution is coarse for the sub-millisecond runs.
 */
import { estimateRespiratory } from '../../app/core/model/allometry.js';
import { buildSimulationSetup, computePlan, resolveMac } from '../../app/core/model/compute-plan.js';
import type { PlanInput } from '../../app/core/model/plan-types.js';
import { simulate, type ScheduleStep } from '../../app/core/model/simulation.js';
import { runUncertainty } from '../../app/core/model/uncertainty.js';
import { agents } from '../../app/core/agents.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { twoHourBudgerigarPlan } from '../core/model/plan-fixtures.js';
import { median } from './figures.js';

// The test fixture's 2-h plan, with the default uncertainty run for the whole-plan figure.
const benchPlan: PlanInput = { ...twoHourBudgerigarPlan, uncertainty: undefined };

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
function analyticWashin(schedule: readonly ScheduleStep[], tauMin: number, breathMin: number, endMin: number): number {
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

/** Runs the model benchmark and returns its figures. */
export async function benchModel(): Promise<Record<string, number>> {
  const estimates = estimateRespiratory(benchPlan.bodyMassG);
  const mac = resolveMac(benchPlan, undefined);
  const setup = buildSimulationSetup(benchPlan, estimates, mac);
  let outcome = simulate(setup);
  for (let warm = 0; warm < 30; warm += 1) outcome = simulate(setup);
  const plan2hMedianMs = timeRuns(200, () => {
    outcome = simulate(setup);
  });
  const uncertaintyInput = { setup, outcome, macSdPct: null, samples: 500, seed: 1, bloodGasRange: agents.isoflurane.bloodGasRange };
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
  const breathMin = 1 / estimates.breathsPerMin.value;
  const tauMin = (estimates.airSacVolumeMl.value + estimates.lungVolumeMl.value) / estimates.minuteVentilationMlMin.value;
  let sink = 0;
  for (let warm = 0; warm < 30; warm += 1) sink += analyticWashin(benchPlan.schedule, tauMin, breathMin, setup.endMin);
  const analyticWashinMedianMs = timeRuns(200, () => {
    sink += analyticWashin(benchPlan.schedule, tauMin, breathMin, setup.endMin);
  });
  const analytic500MedianMs = timeRuns(15, () => {
    for (let run = 0; run < 500; run += 1) sink += analyticWashin(benchPlan.schedule, tauMin * (1 + run / 5000), breathMin, setup.endMin);
  });
  computePlan(benchPlan, { species: speciesReference });
  const computePlanMedianMs = timeRuns(10, () => {
    computePlan(benchPlan, { species: speciesReference });
  });
  return {
    plan2hMedianMs: plan2hMedianMs.wallMs,
    plan2hBreaths: outcome.breaths,
    uncertainty500MedianMs: uncertainty500MedianMs.wallMs,
    uncertainty500CpuMs: uncertainty500MedianMs.cpuMs,
    uncertainty500WithBandMedianMs: uncertainty500WithBandMedianMs.wallMs,
    analyticWashinMedianMs: analyticWashinMedianMs.wallMs,
    planToAnalyticRatio: plan2hMedianMs.wallMs / analyticWashinMedianMs.wallMs,
    analytic500MedianMs: analytic500MedianMs.wallMs,
    analytic500CpuMs: analytic500MedianMs.cpuMs,
    uncertaintyToAnalyticRatio: uncertainty500MedianMs.wallMs / analytic500MedianMs.wallMs,
    computePlanMedianMs: computePlanMedianMs.wallMs,
    computePlanCpuMs: computePlanMedianMs.cpuMs,
    analyticChecksum: Number.isFinite(sink) ? 1 : 0,
  };
}
