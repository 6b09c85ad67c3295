/**
 * Waste anaesthetic gas: agent vapour released to the room and the resulting room concentration
 * for a well-mixed room, against the NIOSH 1977 ceiling of 2 ppm for halogenated agents.
 *
 * Room model (well-mixed room mass balance, the dilution-ventilation equation of industrial
 * hygiene): V dC/dt = G(t) - Q C, with room volume V (m3), ventilation Q = air changes per hour
 * x V / 60 (m3/min) and generation G (m3 vapour/min). Time constant tau = V / Q = 60 / ACH min;
 * a constant release approaches the steady state C = G / Q; after it stops C falls as e^(-t/tau).
 * A well-mixed room understates the concentration in the breathing zone next to a mask
 * (Friembichler et al. 2011 measured 11.2 ppm isoflurane at the anaesthetist during unscavenged
 * mask induction).
 */
import { agents, type AgentId } from '../agents.js';
import { ppmToMgPerM3 } from '../units.js';
import { vapourMlForSchedule, type FreshGasInput, type VaporiserStep } from './consumption.js';
import type { Route } from './flows.js';

/** NIOSH 1977 (Pub. 77-140) recommended exposure limit for halogenated agents: 2 ppm ceiling over up to 1 h. */
export const nioshCeilingPpm = {
  value: 2,
  basis: 'NIOSH 1977 (Pub. 77-140): 2 ppm ceiling for halogenated agents over up to 1 h',
  kind: 'published',
} as const;

/**
 * Fraction of the breathing system's exhaust captured by active scavenging (assumption). Informed by
 * Friembichler et al. 2011 (Acta Vet Scand 53:1): 11.2 ppm without and 2.0 ppm with a scavenging
 * double mask, 1 - 2.0 / 11.2 = 0.82.
 */
export const defaultScavengingCaptureFraction = {
  value: 0.8,
  basis:
    'Assumption informed by Friembichler et al. 2011 (11.2 ppm without and 2.0 ppm with scavenging: 82 % lower)',
  kind: 'assumption',
} as const;

function assertRange(value: number, name: string, min: number, max: number): void {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(
      `${name}: must be a number between ${String(min)} and ${String(max)} (got ${String(value)})`,
    );
  }
}

/**
 * Vapour released when an induction chamber is opened: chamber volume x concentration.
 * @param chamberVolumeL chamber volume in L, 0 to 100
 * @param chamberConcentrationPct agent concentration in the chamber at opening, vol %, 0 to 100
 * @returns vapour in mL
 */
export function chamberOpeningVapourMl(chamberVolumeL: number, chamberConcentrationPct: number): number {
  assertRange(chamberVolumeL, 'chamberVolumeL', 0, 100);
  assertRange(chamberConcentrationPct, 'chamberConcentrationPct', 0, 100);
  return chamberVolumeL * 1000 * (chamberConcentrationPct / 100);
}

export type WasteGasSource = 'chamberOpened' | 'maskLeak' | 'exhaust';

export type WasteGasSourceAmount = {
  readonly source: WasteGasSource;
  /** Vapour reaching the room, mL. */
  readonly vapourMl: number;
  readonly basis: string;
};

export type WasteGasReleaseInput = {
  readonly agent: AgentId;
  readonly route: Route;
  readonly schedule: readonly VaporiserStep[];
  readonly freshGasLpm: FreshGasInput;
  /** End of the plan in min, 0 to 1440. */
  readonly endMin: number;
  /** Active scavenging of the breathing system's exhaust. */
  readonly scavenging: boolean;
  /** Fraction of the exhaust captured when scavenging, 0 to 1; default 0.8 (assumption). */
  readonly scavengingCaptureFraction?: number;
  /** Chamber route: volume in L and the concentration at opening (vol %, from the model; default the highest dial %). */
  readonly chamberVolumeL?: number;
  readonly chamberConcentrationAtOpeningPct?: number;
  /** Mask route: fraction of the flow escaping around the mask, 0 to 1. */
  readonly maskLeakFraction?: number;
};

export type WasteGasRelease = {
  readonly sources: readonly WasteGasSourceAmount[];
  /** Vapour delivered by the vaporiser over the plan, mL. */
  readonly deliveredVapourMl: number;
  /** Vapour reaching the room, mL (sum of the sources). */
  readonly releasedVapourMl: number;
  readonly basis: string;
};

/**
 * Agent vapour released to the room over a plan. Everything the vaporiser delivers leaves the
 * breathing system sooner or later (what the bird takes up is exhaled at recovery), so the
 * release is counted conservatively from the delivered vapour: the mask leak (never scavenged),
 * the chamber contents at opening (never scavenged), and the rest through the exhaust, of which
 * the scavenger captures the stated fraction. Exhalation during recovery after the plan's end is
 * not counted.
 */
export function wasteGasRelease(input: WasteGasReleaseInput): WasteGasRelease {
  const deliveredVapourMl = vapourMlForSchedule({
    agent: input.agent,
    schedule: input.schedule,
    freshGasLpm: input.freshGasLpm,
    endMin: input.endMin,
  });
  const capture = input.scavenging
    ? (input.scavengingCaptureFraction ?? defaultScavengingCaptureFraction.value)
    : 0;
  assertRange(capture, 'scavengingCaptureFraction', 0, 1);
  const sources: WasteGasSourceAmount[] = [];
  let unscavengeable = 0;
  if (input.route === 'mask' && input.maskLeakFraction !== undefined && input.maskLeakFraction > 0) {
    assertRange(input.maskLeakFraction, 'maskLeakFraction', 0, 1);
    const leaked = input.maskLeakFraction * deliveredVapourMl;
    unscavengeable += leaked;
    sources.push({
      source: 'maskLeak',
      vapourMl: leaked,
      basis: 'Leak fraction x vapour delivered during the mask time',
    });
  }
  if (input.route === 'chamber' && input.chamberVolumeL !== undefined) {
    const highestDial = input.schedule.reduce((peak, step) => Math.max(peak, step.vaporPct), 0);
    const atOpening = Math.min(input.chamberConcentrationAtOpeningPct ?? highestDial, highestDial);
    const opened = Math.min(chamberOpeningVapourMl(input.chamberVolumeL, atOpening), deliveredVapourMl);
    unscavengeable += opened;
    sources.push({
      source: 'chamberOpened',
      vapourMl: opened,
      basis: 'Chamber volume x agent concentration when the chamber is opened',
    });
  }
  const exhaust = Math.max(0, deliveredVapourMl - unscavengeable) * (1 - capture);
  sources.push({
    source: 'exhaust',
    vapourMl: exhaust,
    basis: input.scavenging
      ? `Breathing system exhaust with scavenging capturing ${String(capture)}${input.scavengingCaptureFraction === undefined ? ` (${defaultScavengingCaptureFraction.basis})` : ''}`
      : 'Breathing system exhaust without scavenging: all of it reaches the room',
  });
  return {
    sources,
    deliveredVapourMl,
    releasedVapourMl: sources.reduce((sum, source) => sum + source.vapourMl, 0),
    basis:
      'Vapour carried by the fresh gas at the dial setting over the plan; all of it leaves the breathing system (conservative: uptake is exhaled at recovery)',
  };
}

/** One release into the room: `vapourMl` spread evenly over `durationMin` from `startMin` (0 = a puff). */
export type RoomRelease = {
  readonly startMin: number;
  readonly durationMin: number;
  readonly vapourMl: number;
};

export type WasteGasExposureInput = {
  readonly agent: AgentId;
  /** Vapour released at an even rate from 0 min, mL, 0 or more. */
  readonly releasedVapourMl: number;
  /** Duration of that release, min, 0 (a puff) to 1440. */
  readonly releaseDurationMin: number;
  /** Further releases, e.g. the chamber opened at a given minute (a puff). */
  readonly extraReleases?: readonly RoomRelease[];
  /** Room volume, m3, 5 to 5000. */
  readonly roomVolumeM3: number;
  /** Air changes per hour of the room ventilation, 0.1 to 60. */
  readonly airChangesPerHour: number;
  /** Spacing of the returned timeline, min, 0.1 to 60; default 1. */
  readonly sampleMin?: number;
  /** Length of the returned timeline, min; default the end of the last release plus 3 time constants, at least 60. */
  readonly horizonMin?: number;
};

export type RoomConcentrationSample = {
  readonly atMin: number;
  readonly ppm: number;
};

export type WasteGasExposure = {
  readonly timeline: readonly RoomConcentrationSample[];
  readonly peakPpm: number;
  readonly peakAtMin: number;
  readonly peakMgPerM3: number;
  /** Highest mean over any 60-min window, ppm. */
  readonly highestHourMeanPpm: number;
  readonly highestHourMeanMgPerM3: number;
  /** Steady state of the main release if it went on for ever: G / Q, ppm. */
  readonly steadyStatePpm: number;
  /** Room time constant V / Q = 60 / ACH, min. */
  readonly timeConstantMin: number;
  readonly ceilingPpm: number;
  /** True when the highest 1-h mean exceeds the 2 ppm ceiling. */
  readonly exceedsCeiling: boolean;
  /** True when the peak exceeds 2 ppm at any moment. */
  readonly peakAboveCeiling: boolean;
  readonly basis: string;
};

/** Releases shorter than this (min) are treated as a puff, which keeps the rate finite. */
const puffDurationMin = 1e-6;

/** Room concentration (ppm) at time t from one release, analytic solution of V dC/dt = G - Q C. */
function releasePpmAt(
  release: RoomRelease,
  ventilationM3PerMin: number,
  roomVolumeM3: number,
  timeMin: number,
): number {
  const elapsed = timeMin - release.startMin;
  const puff = release.durationMin < puffDurationMin;
  if (elapsed < 0 || (elapsed === 0 && !puff)) return 0;
  const rate = ventilationM3PerMin / roomVolumeM3;
  if (puff) return (release.vapourMl / roomVolumeM3) * Math.exp(-rate * elapsed);
  // mL per minute over m3 per minute is ppm (1 mL per m3 = 1 ppm by volume).
  const steady = release.vapourMl / release.durationMin / ventilationM3PerMin;
  if (elapsed <= release.durationMin) return steady * -Math.expm1(-rate * elapsed);
  return (
    steady * -Math.expm1(-rate * release.durationMin) * Math.exp(-rate * (elapsed - release.durationMin))
  );
}

/** Integral of the room concentration (ppm x min) from one release over [0, t]. */
function releasePpmMinUntil(
  release: RoomRelease,
  ventilationM3PerMin: number,
  roomVolumeM3: number,
  timeMin: number,
): number {
  const elapsed = timeMin - release.startMin;
  if (elapsed <= 0) return 0;
  const rate = ventilationM3PerMin / roomVolumeM3;
  const tau = 1 / rate;
  if (release.durationMin < puffDurationMin)
    return (release.vapourMl / roomVolumeM3) * tau * -Math.expm1(-elapsed / tau);
  const steady = release.vapourMl / release.durationMin / ventilationM3PerMin;
  const during = Math.min(elapsed, release.durationMin);
  const rising = steady * (during + tau * Math.expm1(-during / tau));
  if (elapsed <= release.durationMin) return rising;
  const atEnd = steady * -Math.expm1(-release.durationMin / tau);
  return rising + atEnd * tau * -Math.expm1(-(elapsed - release.durationMin) / tau);
}

/**
 * Room concentration over time for a well-mixed room with first-order dilution by its air
 * changes: V dC/dt = G - Q C, solved analytically for each release and summed. Returns the
 * timeline, the peak, the highest 60-min mean (ppm and mg/m3 at 25 C) and the comparison with
 * the NIOSH 1977 2 ppm ceiling.
 * @throws RangeError when an input is out of range
 */
export function wasteGasExposure(input: WasteGasExposureInput): WasteGasExposure {
  assertRange(input.releasedVapourMl, 'releasedVapourMl', 0, 1e7);
  assertRange(input.releaseDurationMin, 'releaseDurationMin', 0, 1440);
  assertRange(input.roomVolumeM3, 'roomVolumeM3', 5, 5000);
  assertRange(input.airChangesPerHour, 'airChangesPerHour', 0.1, 60);
  const sampleMin = input.sampleMin ?? 1;
  assertRange(sampleMin, 'sampleMin', 0.1, 60);
  const releases: RoomRelease[] = [
    { startMin: 0, durationMin: input.releaseDurationMin, vapourMl: input.releasedVapourMl },
  ];
  (input.extraReleases ?? []).forEach((release, index) => {
    assertRange(release.startMin, `extraReleases[${String(index)}].startMin`, 0, 1440);
    assertRange(release.durationMin, `extraReleases[${String(index)}].durationMin`, 0, 1440);
    assertRange(release.vapourMl, `extraReleases[${String(index)}].vapourMl`, 0, 1e7);
    releases.push(release);
  });
  const ventilationM3PerMin = (input.airChangesPerHour * input.roomVolumeM3) / 60;
  const timeConstantMin = 60 / input.airChangesPerHour;
  const lastReleaseEnd = releases.reduce(
    (latest, release) => Math.max(latest, release.startMin + release.durationMin),
    0,
  );
  const horizonMin = input.horizonMin ?? Math.max(60, lastReleaseEnd + 3 * timeConstantMin);
  assertRange(horizonMin, 'horizonMin', 0, 10000);

  const ppmAt = (timeMin: number): number =>
    releases.reduce(
      (sum, release) => sum + releasePpmAt(release, ventilationM3PerMin, input.roomVolumeM3, timeMin),
      0,
    );
  const ppmMinUntil = (timeMin: number): number =>
    releases.reduce(
      (sum, release) => sum + releasePpmMinUntil(release, ventilationM3PerMin, input.roomVolumeM3, timeMin),
      0,
    );

  const timeline: RoomConcentrationSample[] = [];
  const sampleCount = Math.floor(horizonMin / sampleMin + 1e-9);
  for (let index = 0; index <= sampleCount; index += 1) {
    const atMin = index * sampleMin;
    timeline.push({ atMin, ppm: ppmAt(atMin) });
  }

  // Each constant-rate release rises until it ends and then decays, so the peak of the sum lies
  // at a release's start or end (a puff peaks at its start) or, when releases overlap, between
  // them: check the boundaries and a fine grid.
  const windowMin = 60;
  const gridSteps = Math.min(4000, Math.max(240, Math.ceil(Math.max(horizonMin, windowMin) / 0.25)));
  const gridStepMin = Math.max(horizonMin, windowMin) / gridSteps;
  let peakPpm = 0;
  let peakAtMin = 0;
  const consider = (atMin: number): void => {
    const ppm = ppmAt(atMin);
    if (ppm > peakPpm) {
      peakPpm = ppm;
      peakAtMin = atMin;
    }
  };
  for (const release of releases) {
    consider(release.startMin);
    consider(release.startMin + release.durationMin);
  }
  for (let index = 0; index <= gridSteps; index += 1) consider(index * gridStepMin);

  // Highest mean over any 60-min window: exact integrals at window starts on the grid.
  let highestHourMeanPpm = 0;
  const windowLimit = Math.max(horizonMin, windowMin) - windowMin;
  for (let index = 0; index <= gridSteps; index += 1) {
    const startMin = Math.min(index * gridStepMin, windowLimit);
    const mean = (ppmMinUntil(startMin + windowMin) - ppmMinUntil(startMin)) / windowMin;
    if (mean > highestHourMeanPpm) highestHourMeanPpm = mean;
    if (startMin >= windowLimit) break;
  }

  const molecularWeight = agents[input.agent].molecularWeightGPerMol.value;
  const steadyStatePpm =
    input.releaseDurationMin >= puffDurationMin
      ? input.releasedVapourMl / input.releaseDurationMin / ventilationM3PerMin
      : 0;
  return {
    timeline,
    peakPpm,
    peakAtMin,
    peakMgPerM3: ppmToMgPerM3(peakPpm, molecularWeight),
    highestHourMeanPpm,
    highestHourMeanMgPerM3: ppmToMgPerM3(highestHourMeanPpm, molecularWeight),
    steadyStatePpm,
    timeConstantMin,
    ceilingPpm: nioshCeilingPpm.value,
    exceedsCeiling: highestHourMeanPpm > nioshCeilingPpm.value,
    peakAboveCeiling: peakPpm > nioshCeilingPpm.value,
    basis:
      'Well-mixed room: the vapour released is diluted by the room air changes (derived); ' +
      `ppm turned into mg/m3 at 25 C; ${nioshCeilingPpm.basis}. The breathing zone next to a mask can be far higher than the room mean.`,
  };
}
