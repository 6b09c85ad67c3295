import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { planInputSchema, planIssueMessages } from '../../app/contract/plan.js';

const valid = {
  bodyMassG: 32,
  agent: 'isoflurane',
  route: 'mask',
  freshGasLpm: 1,
  schedule: [
    { atMin: 0, vaporPct: 4 },
    { atMin: 10, vaporPct: 0 },
  ],
};

type Case = { name: string; plan: unknown; field: string; words: string };

const bad: Case[] = [
  {
    name: 'body mass too small',
    plan: { ...valid, bodyMassG: 2 },
    field: 'bodyMassG',
    words: 'body mass must be between 5 g and 15000 g',
  },
  {
    name: 'body mass of 30 kg',
    plan: { ...valid, bodyMassG: 30000 },
    field: 'bodyMassG',
    words: 'between 5 g and 15000 g',
  },
  {
    name: 'body mass as text',
    plan: { ...valid, bodyMassG: '32' },
    field: 'bodyMassG',
    words: 'body mass must be a number',
  },
  {
    name: 'body mass missing',
    plan: { agent: 'isoflurane', route: 'mask', freshGasLpm: 1, schedule: valid.schedule },
    field: 'bodyMassG',
    words: 'body mass is required',
  },
  {
    name: 'unknown agent',
    plan: { ...valid, agent: 'halothane' },
    field: 'agent',
    words: 'agent must be isoflurane, sevoflurane or desflurane',
  },
  { name: 'unknown route', plan: { ...valid, route: 'nasal' }, field: 'route', words: 'route must be' },
  {
    name: 'unknown circuit',
    plan: { ...valid, circuit: 'bain' },
    field: 'circuit',
    words: 'circuit must be nonRebreathing or circle',
  },
  {
    name: 'zero fresh gas',
    plan: { ...valid, freshGasLpm: 0 },
    field: 'freshGasLpm',
    words: 'fresh gas flow must be between',
  },
  {
    name: 'fresh gas too high',
    plan: { ...valid, freshGasLpm: 50 },
    field: 'freshGasLpm',
    words: 'fresh gas flow must be between',
  },
  { name: 'MAC too high', plan: { ...valid, macPct: 40 }, field: 'macPct', words: 'MAC must be between' },
  {
    name: 'empty schedule',
    plan: { ...valid, schedule: [] },
    field: 'schedule',
    words: 'at least one vaporiser step',
  },
  {
    name: 'schedule not a list',
    plan: { ...valid, schedule: { atMin: 0, vaporPct: 2 } },
    field: 'schedule',
    words: 'list of vaporiser steps',
  },
  {
    name: 'first step not at 0',
    plan: { ...valid, schedule: [{ atMin: 2, vaporPct: 4 }] },
    field: 'schedule[0].atMin',
    words: 'must start at 0 min',
  },
  {
    name: 'steps out of order',
    plan: {
      ...valid,
      schedule: [
        { atMin: 0, vaporPct: 4 },
        { atMin: 20, vaporPct: 2 },
        { atMin: 10, vaporPct: 0 },
      ],
    },
    field: 'schedule[2].atMin',
    words: 'time order',
  },
  {
    name: 'two steps at the same minute',
    plan: {
      ...valid,
      schedule: [
        { atMin: 0, vaporPct: 4 },
        { atMin: 0, vaporPct: 2 },
      ],
    },
    field: 'schedule[1].atMin',
    words: 'time order',
  },
  {
    name: 'negative dial',
    plan: { ...valid, schedule: [{ atMin: 0, vaporPct: -1 }] },
    field: 'schedule[0].vaporPct',
    words: 'dial setting must be between 0 % and 20 %',
  },
  {
    name: 'dial above 20 %',
    plan: { ...valid, schedule: [{ atMin: 0, vaporPct: 25 }] },
    field: 'schedule[0].vaporPct',
    words: 'dial setting',
  },
  {
    name: 'step time negative',
    plan: { ...valid, schedule: [{ atMin: -1, vaporPct: 2 }] },
    field: 'schedule[0].atMin',
    words: 'step time must be between',
  },
  {
    name: 'misspelt step field',
    plan: { ...valid, schedule: [{ atMin: 0, vapourPct: 2 }] },
    field: 'schedule[0]',
    words: '"vapourPct" is not part of a vaporiser step',
  },
  {
    name: 'chamber without volume',
    plan: { ...valid, route: 'chamber' },
    field: 'chamberVolumeL',
    words: 'chamber volume is needed',
  },
  {
    name: 'chamber volume too small',
    plan: { ...valid, route: 'chamber', chamberVolumeL: 0.01 },
    field: 'chamberVolumeL',
    words: 'chamber volume must be between',
  },
  {
    name: 'circle without volume',
    plan: { ...valid, route: 'endotracheal', circuit: 'circle' },
    field: 'circuitVolumeL',
    words: 'circle volume',
  },
  {
    name: 'air-sac tube on a circle',
    plan: { ...valid, route: 'airSacTube', circuit: 'circle', circuitVolumeL: 2 },
    field: 'circuit',
    words: 'non-rebreathing',
  },
  {
    name: 'IPPV by mask',
    plan: { ...valid, ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 0.3 } },
    field: 'ventilation.mode',
    words: 'IPPV needs an endotracheal tube',
  },
  {
    name: 'IPPV starting in the default room-air gap before the tube phase',
    plan: {
      ...valid,
      laterPhases: [{ startMin: 5, route: 'endotracheal', freshGasLpm: 0.5 }],
      ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 0.3, fromMin: 5 },
    },
    field: 'ventilation.fromMin',
    words: 'start it once the tube phase is running (from 5.5 min, after its gap on room air)',
  },
  {
    name: 'a mask phase after IPPV has started',
    plan: {
      ...valid,
      route: 'endotracheal',
      laterPhases: [{ startMin: 5, route: 'mask', freshGasLpm: 0.5 }],
      ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 0.3 },
    },
    field: 'laterPhases[0].route',
    words: 'a later mask phase cannot follow it',
  },
  {
    name: 'IPPV without rate',
    plan: { ...valid, route: 'endotracheal', ventilation: { mode: 'ippv', tidalVolumeMl: 0.3 } },
    field: 'ventilation.breathsPerMin',
    words: 'ventilator rate is required',
  },
  {
    name: 'IPPV rate too high',
    plan: {
      ...valid,
      route: 'endotracheal',
      ventilation: { mode: 'ippv', breathsPerMin: 400, tidalVolumeMl: 0.3 },
    },
    field: 'ventilation.breathsPerMin',
    words: 'ventilator rate must be between',
  },
  {
    name: 'IPPV tidal volume far above the bird',
    plan: {
      ...valid,
      route: 'endotracheal',
      ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 30 },
    },
    field: 'ventilation.tidalVolumeMl',
    words: 'more than 10 times',
  },
  {
    name: 'unknown ventilation mode',
    plan: { ...valid, ventilation: { mode: 'jet' } },
    field: 'ventilation.mode',
    words: 'ventilation mode must be spontaneous or ippv',
  },
  {
    name: 'IPPV starting after the plan',
    plan: {
      ...valid,
      route: 'endotracheal',
      ventilation: { mode: 'ippv', breathsPerMin: 20, tidalVolumeMl: 0.3, fromMin: 500 },
    },
    field: 'ventilation.fromMin',
    words: 'before the end of the plan',
  },
  {
    name: 'mask leak of 1',
    plan: { ...valid, maskLeakFraction: 1 },
    field: 'maskLeakFraction',
    words: 'mask leak fraction must be between 0 and 0.9',
  },
  {
    name: 'mask dead space on a tube',
    plan: { ...valid, route: 'endotracheal', maskDeadSpaceMl: 3 },
    field: 'maskDeadSpaceMl',
    words: 'only to the mask route',
  },
  {
    name: 'target depth too deep',
    plan: { ...valid, targetMacMultiple: 5 },
    field: 'targetMacMultiple',
    words: 'planned depth must be between',
  },
  {
    name: 'recovery fraction of 1',
    plan: { ...valid, recoveryMacFraction: 1 },
    field: 'recoveryMacFraction',
    words: 'recovery threshold must be between',
  },
  {
    name: 'recovery window too long',
    plan: { ...valid, recoveryWindowMin: 1000 },
    field: 'recoveryWindowMin',
    words: 'recovery window must be between',
  },
  {
    name: 'plan longer than a day',
    plan: {
      ...valid,
      schedule: [
        { atMin: 0, vaporPct: 2 },
        { atMin: 1430, vaporPct: 0 },
      ],
    },
    field: 'recoveryWindowMin',
    words: 'within 24 h',
  },
  {
    name: 'species id with spaces',
    plan: { ...valid, speciesId: 'Pekin Duck' },
    field: 'speciesId',
    words: 'lower-case words joined by hyphens',
  },
  {
    name: 'measured tidal volume of 0',
    plan: { ...valid, overrides: { tidalVolumeMl: 0 } },
    field: 'overrides.tidalVolumeMl',
    words: 'measured tidal volume must be between',
  },
  {
    name: 'measured tidal volume 1000 times the estimate',
    plan: { ...valid, overrides: { tidalVolumeMl: 300 } },
    field: 'overrides.tidalVolumeMl',
    words: 'more than 10 times off',
  },
  {
    name: 'measured heart rate far too slow',
    plan: { ...valid, overrides: { heartRatePerMin: 25 } },
    field: 'overrides.heartRatePerMin',
    words: 'check the value and the units',
  },
  {
    name: 'unknown override',
    plan: { ...valid, overrides: { lungCapacityMl: 3 } },
    field: 'overrides',
    words: '"lungCapacityMl" is not part of the measured values',
  },
  {
    name: 'misspelt top-level field',
    plan: { ...valid, freshGasLPM: 1 },
    field: '(plan)',
    words: '"freshGasLPM" is not part of a plan',
  },
  {
    name: 'scavenging as text',
    plan: { ...valid, scavenging: 'yes' },
    field: 'scavenging',
    words: 'scavenging must be true or false',
  },
  {
    name: 'room too small',
    plan: { ...valid, room: { volumeM3: 1, airChangesPerHour: 10 } },
    field: 'room.volumeM3',
    words: 'room volume must be between',
  },
  {
    name: 'unknown cylinder preset',
    plan: { ...valid, cylinder: { kind: 'preset', presetId: 'us-h' } },
    field: 'cylinder.presetId',
    words: 'cylinder preset must be',
  },
  {
    name: 'cylinder pressure too high',
    plan: { ...valid, cylinder: { kind: 'waterCapacity', waterCapacityL: 10, pressureBar: 500 } },
    field: 'cylinder.pressureBar',
    words: 'cylinder pressure must be between',
  },
  {
    name: 'uncertainty samples fractional',
    plan: { ...valid, uncertainty: { samples: 10.5, seed: 1 } },
    field: 'uncertainty.samples',
    words: 'whole number',
  },
  {
    name: 'vaporiser temperature too cold',
    plan: { ...valid, vaporiserTemperatureC: 0 },
    field: 'vaporiserTemperatureC',
    words: 'vaporiser temperature must be between',
  },
  {
    name: 'body temperature too cold',
    plan: { ...valid, bodyTemperatureC: 25 },
    field: 'bodyTemperatureC',
    words: 'body temperature must be between 30 C and 44 C',
  },
  {
    name: 'body temperature too hot',
    plan: { ...valid, bodyTemperatureC: 45 },
    field: 'bodyTemperatureC',
    words: 'body temperature must be between 30 C and 44 C',
  },
  { name: 'plan not an object', plan: [1, 2, 3], field: '(plan)', words: 'a plan must be an object' },
];

describe('plan input validation', () => {
  it('has at least 30 bad inputs to check', () => {
    expect(bad.length).toBeGreaterThanOrEqual(30);
  });
  it.each(bad.map((entry) => [entry.name, entry] as const))(
    'rejects %s, naming the field and why',
    (_name, entry) => {
      const parsed = planInputSchema.safeParse(entry.plan);
      expect(parsed.success).toBe(false);
      if (parsed.success) return;
      const messages = planIssueMessages(parsed.error);
      const matching = messages.filter((message) => message.startsWith(`${entry.field}: `));
      expect(matching, messages.join('\n')).not.toEqual([]);
      expect(matching.join('\n')).toContain(entry.words);
    },
  );
  it('writes the body mass message in the words a vet reads', () => {
    const parsed = planInputSchema.safeParse({ ...valid, bodyMassG: 1 });
    expect(parsed.success).toBe(false);
    if (!parsed.success)
      expect(planIssueMessages(parsed.error)).toEqual([
        'bodyMassG: body mass must be between 5 g and 15000 g',
      ]);
  });
  it('accepts a minimal plan and every example plan', () => {
    expect(planInputSchema.safeParse(valid).success).toBe(true);
    const folder = new URL('../../examples/plans/', import.meta.url);
    const files = readdirSync(folder).filter((file) => file.endsWith('.json'));
    expect(files.length).toBeGreaterThanOrEqual(2);
    for (const file of files) {
      const parsed = planInputSchema.safeParse(JSON.parse(readFileSync(new URL(file, folder), 'utf8')));
      expect(
        parsed.success,
        `${file}: ${parsed.success ? '' : planIssueMessages(parsed.error).join('; ')}`,
      ).toBe(true);
    }
  });
});
