import { describe, expect, it } from 'vitest';
import { vapourMlForSchedule } from '../../../app/core/budget/consumption.js';
import {
  chamberOpeningVapourMl,
  defaultScavengingCaptureFraction,
  nioshCeilingPpm,
  wasteGasExposure,
  wasteGasRelease,
  type RoomRelease,
} from '../../../app/core/budget/waste-gas.js';
import { ppmToMgPerM3 } from '../../../app/core/units.js';

/**
 * Referee: integrates V dC/dt = G(t) - Q C with classic fourth-order Runge-Kutta steps,
 * independently of the closed form under test. Puffs are added as a jump at their start.
 * Returns ppm (mL per m3) at `atMin`.
 */
function integrateRoom(
  releases: readonly RoomRelease[],
  roomVolumeM3: number,
  airChangesPerHour: number,
  atMin: number,
  stepMin = 0.005,
): number {
  const ventilation = (airChangesPerHour * roomVolumeM3) / 60;
  const generation = (timeMin: number): number =>
    releases.reduce(
      (sum, release) =>
        release.durationMin > 0 &&
        timeMin >= release.startMin &&
        timeMin < release.startMin + release.durationMin
          ? sum + release.vapourMl / release.durationMin
          : sum,
      0,
    );
  const derivative = (timeMin: number, contentMl: number): number =>
    generation(timeMin) - (ventilation / roomVolumeM3) * contentMl;
  let contentMl = 0;
  let time = 0;
  const puffs = releases.filter((release) => release.durationMin === 0);
  while (time < atMin - 1e-12) {
    for (const puff of puffs)
      if (puff.startMin >= time && puff.startMin < time + stepMin / 2) contentMl += puff.vapourMl;
    const h = Math.min(stepMin, atMin - time);
    const k1 = derivative(time, contentMl);
    const k2 = derivative(time + h / 2, contentMl + (h / 2) * k1);
    const k3 = derivative(time + h / 2, contentMl + (h / 2) * k2);
    const k4 = derivative(time + h, contentMl + h * k3);
    contentMl += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
    time += h;
  }
  return contentMl / roomVolumeM3;
}

describe('ppm and mg/m3', () => {
  it('gives 16.15 mg/m3 for 2 ppm halothane at 25 C', () => {
    // ppm to mg/m3 at 25 C: ppm x MW / 24.45 [published example: halothane 2 ppm = 16.15 mg/m3], MW 197.4
    expect(ppmToMgPerM3(2, 197.4)).toBeCloseTo(16.15, 2);
  });

  it('reports the peak in mg/m3 with the agent molecular weight', () => {
    // isoflurane MW 184.5 [published, label]
    const exposure = wasteGasExposure({
      agent: 'isoflurane',
      releasedVapourMl: 600,
      releaseDurationMin: 30,
      roomVolumeM3: 40,
      airChangesPerHour: 6,
    });
    expect(exposure.peakMgPerM3).toBeCloseTo((exposure.peakPpm * 184.5) / 24.45, 9);
  });
});

describe('well-mixed room', () => {
  it('approaches the analytic steady state, generation rate / ventilation rate', () => {
    // well-mixed room mass balance: steady state C = G / Q [derived]; 20 mL/min into 30 m3 at 10 air changes
    // per hour (Q = 5 m3/min) gives 4 ppm
    const exposure = wasteGasExposure({
      agent: 'isoflurane',
      releasedVapourMl: 20 * 600,
      releaseDurationMin: 600,
      roomVolumeM3: 30,
      airChangesPerHour: 10,
    });
    expect(exposure.steadyStatePpm).toBeCloseTo(4, 12);
    expect(exposure.peakPpm).toBeCloseTo(4, 6);
    expect(exposure.highestHourMeanPpm).toBeCloseTo(4, 6);
    expect(exposure.exceedsCeiling).toBe(true);
  });

  it('decays by e after one time constant of 60 / air changes per hour minutes', () => {
    // first-order dilution: tau = V / Q = 60 / ACH min; C falls to e^-1 after one tau [derived]
    const exposure = wasteGasExposure({
      agent: 'sevoflurane',
      releasedVapourMl: 300,
      releaseDurationMin: 20,
      roomVolumeM3: 50,
      airChangesPerHour: 6,
      sampleMin: 1,
      horizonMin: 60,
    });
    expect(exposure.timeConstantMin).toBe(10);
    const atEnd = exposure.timeline.find((sample) => sample.atMin === 20)?.ppm ?? Number.NaN;
    const oneTauLater = exposure.timeline.find((sample) => sample.atMin === 30)?.ppm ?? Number.NaN;
    expect(oneTauLater / atEnd).toBeCloseTo(Math.exp(-1), 10);
    expect(exposure.peakAtMin).toBeCloseTo(20, 6);
  });

  it('agrees with a step-by-step integration of the mass balance, puffs included', () => {
    const releases: RoomRelease[] = [
      { startMin: 0, durationMin: 45, vapourMl: 900 },
      { startMin: 5, durationMin: 0, vapourMl: 250 },
    ];
    const exposure = wasteGasExposure({
      agent: 'isoflurane',
      releasedVapourMl: 900,
      releaseDurationMin: 45,
      extraReleases: [{ startMin: 5, durationMin: 0, vapourMl: 250 }],
      roomVolumeM3: 35,
      airChangesPerHour: 4,
      sampleMin: 5,
      horizonMin: 90,
    });
    for (const atMin of [10, 45, 70]) {
      const referee = integrateRoom(releases, 35, 4, atMin);
      const sample = exposure.timeline.find((point) => point.atMin === atMin)?.ppm ?? Number.NaN;
      expect(Math.abs(sample - referee) / referee).toBeLessThan(1e-3);
    }
    // the puff sets the peak at 5 min: 250 mL into 35 m3 on top of what the steady release built up
    expect(exposure.peakAtMin).toBeCloseTo(5, 6);
  });

  it('stays below the 2 ppm ceiling for a small release in a well-ventilated room', () => {
    // NIOSH 1977 (Pub. 77-140): 2 ppm ceiling for halogenated agents over up to 1 h [published]
    const exposure = wasteGasExposure({
      agent: 'isoflurane',
      releasedVapourMl: 100,
      releaseDurationMin: 60,
      roomVolumeM3: 60,
      airChangesPerHour: 12,
    });
    expect(exposure.ceilingPpm).toBe(nioshCeilingPpm.value);
    expect(exposure.ceilingPpm).toBe(2);
    expect(exposure.exceedsCeiling).toBe(false);
    expect(exposure.peakAboveCeiling).toBe(false);
    expect(exposure.highestHourMeanPpm).toBeLessThan(exposure.peakPpm);
  });

  it('refuses a room with no air change', () => {
    expect(() =>
      wasteGasExposure({
        agent: 'isoflurane',
        releasedVapourMl: 100,
        releaseDurationMin: 60,
        roomVolumeM3: 60,
        airChangesPerHour: 0,
      }),
    ).toThrow(/airChangesPerHour/);
  });
});

describe('release to the room', () => {
  const schedule = [
    { atMin: 0, vaporPct: 5 },
    { atMin: 5, vaporPct: 2 },
    { atMin: 45, vaporPct: 0 },
  ];

  it('sends all delivered vapour to the room without scavenging', () => {
    const release = wasteGasRelease({
      agent: 'isoflurane',
      route: 'endotracheal',
      schedule,
      freshGasLpm: 1,
      endMin: 60,
      scavenging: false,
    });
    const delivered = vapourMlForSchedule({ agent: 'isoflurane', schedule, freshGasLpm: 1, endMin: 60 });
    expect(release.deliveredVapourMl).toBeCloseTo(delivered, 9);
    expect(release.releasedVapourMl).toBeCloseTo(delivered, 9);
  });

  it('lets the uncaptured share of the exhaust through with scavenging', () => {
    // capture fraction 0.8 is an assumption informed by Friembichler et al. 2011 (11.2 vs 2.0 ppm)
    const release = wasteGasRelease({
      agent: 'isoflurane',
      route: 'endotracheal',
      schedule,
      freshGasLpm: 1,
      endMin: 60,
      scavenging: true,
    });
    expect(release.releasedVapourMl).toBeCloseTo(
      release.deliveredVapourMl * (1 - defaultScavengingCaptureFraction.value),
      9,
    );
  });

  it('never scavenges the mask leak or the chamber contents', () => {
    const mask = wasteGasRelease({
      agent: 'isoflurane',
      route: 'mask',
      schedule,
      freshGasLpm: 1,
      endMin: 60,
      scavenging: true,
      scavengingCaptureFraction: 1,
      maskLeakFraction: 0.3,
    });
    expect(mask.releasedVapourMl).toBeCloseTo(0.3 * mask.deliveredVapourMl, 9);
    const chamber = wasteGasRelease({
      agent: 'isoflurane',
      route: 'chamber',
      schedule,
      freshGasLpm: 1,
      endMin: 60,
      scavenging: true,
      scavengingCaptureFraction: 1,
      chamberVolumeL: 4,
      chamberConcentrationAtOpeningPct: 4.5,
    });
    expect(chamber.releasedVapourMl).toBeCloseTo(180, 9);
    expect(chamber.sources.map((source) => source.source)).toEqual(['chamberOpened', 'exhaust']);
  });

  it('counts chamber volume x concentration', () => {
    // chamber opened: volume x concentration (common practice)
    expect(chamberOpeningVapourMl(5, 4)).toBeCloseTo(200, 9);
  });
});
