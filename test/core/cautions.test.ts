import { describe, expect, it } from 'vitest';
import { collectCautions, type CautionContext } from '../../app/core/cautions.js';
import { speciesReference } from '../../app/core/species-reference.js';

const findSpeciesReference = (id: string) => speciesReference.find((species) => species.id === id);

function codes(context: CautionContext): string[] {
  return collectCautions(context).map((caution) => caution.code);
}

// budgerigar 25-35 g, exhibition 30-60 g [common practice, owner-facing sources]
const budgerigar = { speciesName: 'Budgerigar', speciesMassRangeG: { minG: 25, maxG: 60 } } as const;

describe('nothing to say', () => {
  it('gives no caution for an empty context', () => {
    expect(collectCautions({})).toEqual([]);
  });

  it('gives no caution for a sound mask plan on a budgerigar', () => {
    // isoflurane saturated 31.3 % [derived]; practical floor 0.5-1 L/min [common practice]
    expect(
      codes({
        ...budgerigar,
        bodyMassG: 34,
        agent: 'isoflurane',
        highestDialPct: 5,
        freshGasLpm: 1,
        minimumFreshGasLpm: 0.05,
        route: 'mask',
        circuit: 'nonRebreathing',
        scavenging: true,
        wasteGasPeakPpm: 0.4,
        wasteGasHourMeanPpm: 0.2,
        predictedPeakBrainMacMultiple: 1.3,
        macIsPublishedForBird: true,
      }),
    ).toEqual([]);
  });
});

describe('body mass', () => {
  it('calls 34000 g for a budgerigar a likely unit slip, not just out of range', () => {
    const cautions = collectCautions({ ...budgerigar, bodyMassG: 34000 });
    expect(cautions.map((caution) => caution.code)).toEqual(['mass-unit-slip']);
    expect(cautions[0]?.severity).toBe('danger');
    expect(cautions[0]?.message).toMatch(/kilograms/);
  });

  it('calls 0.034 g for a budgerigar a likely unit slip the other way', () => {
    expect(codes({ ...budgerigar, bodyMassG: 0.034 })).toEqual(['mass-unit-slip']);
  });

  it('calls 30 kg for a 30 g species a unit slip', () => {
    // zebra finch 10-16 g, canary 12-30 g [common practice, owner-facing sources]
    const canary = findSpeciesReference('canary');
    expect(codes({ bodyMassG: 30000, speciesMassRangeG: canary?.typicalMassG })).toEqual(['mass-unit-slip']);
  });

  it('warns of a mass outside the species range that is no unit slip', () => {
    const cautions = collectCautions({ ...budgerigar, bodyMassG: 80 });
    expect(cautions.map((caution) => caution.code)).toEqual(['mass-outside-species-range']);
    expect(cautions[0]?.severity).toBe('warning');
    expect(cautions[0]?.reason).toMatch(/common practice/);
  });

  it('stays quiet inside the range and at its edges', () => {
    for (const bodyMassG of [25, 40, 60]) expect(codes({ ...budgerigar, bodyMassG })).toEqual([]);
  });
});

describe('agent and dial', () => {
  it('flags a dial above the saturated concentration of the agent', () => {
    // sevoflurane saturated 20.7 % at 20 C, 760 mmHg [derived]
    const cautions = collectCautions({ agent: 'sevoflurane', highestDialPct: 25 });
    expect(cautions.map((caution) => caution.code)).toEqual(['dial-above-saturated']);
    expect(cautions[0]?.message).toMatch(/20\.7 %/);
    expect(codes({ agent: 'sevoflurane', highestDialPct: 8 })).toEqual([]);
  });

  it('uses a saturated concentration given in the context', () => {
    expect(codes({ agent: 'isoflurane', highestDialPct: 5, saturatedPct: 4 })).toEqual([
      'dial-above-saturated',
    ]);
  });

  it('warns that desflurane has no avian MAC', () => {
    // desflurane in birds: none found [reference list]
    const cautions = collectCautions({ agent: 'desflurane', highestDialPct: 6 });
    expect(cautions.map((caution) => caution.code)).toEqual(['desflurane-no-avian-mac']);
    expect(cautions[0]?.severity).toBe('warning');
  });

  it('notes a fallback MAC when the species has no published value', () => {
    expect(codes({ agent: 'isoflurane', macIsPublishedForBird: false })).toEqual([
      'mac-not-published-for-species',
    ]);
    expect(codes({ agent: 'isoflurane', macIsPublishedForBird: true })).toEqual([]);
  });
});

describe('fresh gas flow', () => {
  it('flags a non-rebreathing flow below its minimum as rebreathing', () => {
    // non-rebreathing 2-3 x minute ventilation [common practice]
    const cautions = collectCautions({
      route: 'endotracheal',
      circuit: 'nonRebreathing',
      freshGasLpm: 0.6,
      minimumFreshGasLpm: 0.8,
    });
    expect(cautions.map((caution) => caution.code)).toEqual([
      'flow-below-rebreathing-minimum',
      'uncuffed-tube',
    ]);
    expect(cautions[0]?.severity).toBe('danger');
    expect(
      codes({ route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.9, minimumFreshGasLpm: 0.8 }),
    ).toEqual(['uncuffed-tube']);
    expect(
      codes({ route: 'airSacTube', circuit: 'circle', freshGasLpm: 0.6, minimumFreshGasLpm: 0.8 }),
    ).toEqual(['flow-below-rebreathing-minimum']);
  });

  it('does not call a circle at low flow rebreathing', () => {
    expect(
      codes({
        route: 'endotracheal',
        circuit: 'circle',
        freshGasLpm: 0.6,
        minimumFreshGasLpm: 0.8,
        bodyMassG: 9000,
      }),
    ).toEqual(['uncuffed-tube']);
  });

  it('notes a flow below the practical floor', () => {
    // practical floor of about 0.5-1 L/min [common practice]
    expect(
      codes({ route: 'mask', circuit: 'nonRebreathing', freshGasLpm: 0.3, minimumFreshGasLpm: 0.05 }),
    ).toEqual(['flow-below-practical-floor']);
  });

  it('warns of a chamber flow too slow to fill the chamber in 10 min', () => {
    expect(codes({ route: 'chamber', freshGasLpm: 1, minimumFreshGasLpm: 1.5, scavenging: true })).toEqual([
      'chamber-flow-slow',
    ]);
    expect(codes({ route: 'chamber', freshGasLpm: 2, minimumFreshGasLpm: 1.5, scavenging: true })).toEqual(
      [],
    );
  });
});

describe('circuit for the size of bird', () => {
  it('notes a non-rebreathing system for a bird above 7 kg', () => {
    // non-rebreathing systems below about 7-10 kg [common practice]
    expect(codes({ bodyMassG: 9000, circuit: 'nonRebreathing', route: 'endotracheal' })).toEqual([
      'non-rebreathing-large-bird',
      'uncuffed-tube',
    ]);
    expect(codes({ bodyMassG: 5000, circuit: 'nonRebreathing', route: 'mask' })).toEqual([]);
  });

  it('warns of a circle for a bird below 7 kg', () => {
    expect(codes({ bodyMassG: 3000, circuit: 'circle', route: 'mask' })).toEqual(['circle-small-bird']);
    expect(codes({ bodyMassG: 9000, circuit: 'circle', route: 'mask' })).toEqual([]);
  });
});

describe('apnoea', () => {
  const duck = findSpeciesReference('pekin-duck');
  const chicken = findSpeciesReference('chicken');

  it('flags a duck plan that reaches 1.5 MAC and spares one that stays below', () => {
    // duck apnoea common above 1.5 MAC (Ludders, Mitchell & Rode 1990, Vet Surg 19) [published]
    const cautions = collectCautions({
      predictedPeakBrainMacMultiple: 1.6,
      apnoeaMacMultiple: duck?.apnoeaMacMultiple,
    });
    expect(cautions.map((caution) => caution.code)).toEqual(['apnoea-risk']);
    expect(cautions[0]?.severity).toBe('danger');
    expect(cautions[0]?.reason).toMatch(/Ludders, Mitchell & Rode 1990/);
    expect(codes({ predictedPeakBrainMacMultiple: 1.4, apnoeaMacMultiple: duck?.apnoeaMacMultiple })).toEqual(
      [],
    );
  });

  it('lets a chicken reach 2 MAC without an apnoea caution but not 3 MAC', () => {
    // chicken apnoea at 3.31 % isoflurane = 2.8 MAC (Midon et al. 2021) [published; derived]
    expect(
      codes({ predictedPeakBrainMacMultiple: 2.0, apnoeaMacMultiple: chicken?.apnoeaMacMultiple }),
    ).toEqual([]);
    expect(
      codes({ predictedPeakBrainMacMultiple: 3.0, apnoeaMacMultiple: chicken?.apnoeaMacMultiple }),
    ).toEqual(['apnoea-risk']);
  });

  it('warns when a chicken breathes more than its published apnoea level, and not below it', () => {
    // chicken apnoea at 3.31 % isoflurane = 2.8 MAC (Midon et al. 2021, J Zoo Wildl Med 52:327-331) [published; derived]
    const cautions = collectCautions({
      peakInspiredMacMultiple: 4.2,
      apnoeaMacMultiple: chicken?.apnoeaMacMultiple,
    });
    expect(cautions.map((caution) => caution.code)).toEqual(['inspired-above-apnoea-level']);
    expect(cautions[0]?.severity).toBe('warning');
    expect(cautions[0]?.message).toContain('1.5 times the 2.81 x MAC');
    expect(cautions[0]?.reason).toMatch(/Midon et al\. 2021/);
    expect(codes({ peakInspiredMacMultiple: 2.5, apnoeaMacMultiple: chicken?.apnoeaMacMultiple })).toEqual(
      [],
    );
  });

  it('gives no inspired-level caution for a species without a published apnoea level', () => {
    expect(codes({ peakInspiredMacMultiple: 4.2 })).toEqual([]);
  });

  it('uses the lowest published multiple, 1.5 MAC, as a warning when the species has none', () => {
    const cautions = collectCautions({ predictedPeakBrainMacMultiple: 1.7 });
    expect(cautions.map((caution) => caution.severity)).toEqual(['warning']);
    expect(codes({ predictedPeakBrainMacMultiple: 1.2 })).toEqual([]);
  });
});

describe('room and staff', () => {
  it('warns of a long stay in the chamber', () => {
    expect(codes({ route: 'chamber', chamberExposureMin: 15 })).toEqual(['long-chamber-exposure']);
    expect(codes({ route: 'chamber', chamberExposureMin: 5 })).toEqual([]);
    expect(codes({ route: 'mask', chamberExposureMin: 15 })).toEqual([]);
  });

  it('warns when there is no scavenging and only then', () => {
    // 11.2 ppm without vs 2.0 ppm with a scavenging double mask (Friembichler et al. 2011, Acta Vet Scand 53:1) [published]
    const cautions = collectCautions({ scavenging: false });
    expect(cautions.map((caution) => caution.code)).toEqual(['no-scavenging']);
    expect(cautions[0]?.reason).toMatch(/Friembichler/);
    expect(codes({ scavenging: true })).toEqual([]);
    expect(codes({})).toEqual([]);
  });

  it('warns when the room concentration exceeds the 2 ppm ceiling', () => {
    // NIOSH 1977 (Pub. 77-140): 2 ppm ceiling [published]
    const cautions = collectCautions({ wasteGasPeakPpm: 3.1, wasteGasHourMeanPpm: 1.2 });
    expect(cautions.map((caution) => caution.code)).toEqual(['waste-gas-above-ceiling']);
    expect(cautions[0]?.reason).toMatch(/NIOSH 1977/);
    expect(codes({ wasteGasHourMeanPpm: 2.5 })).toEqual(['waste-gas-above-ceiling']);
    expect(codes({ wasteGasPeakPpm: 1.9, wasteGasHourMeanPpm: 0.9 })).toEqual([]);
  });
});

describe('airway and ventilation', () => {
  it('advises an uncuffed tube on the endotracheal route only', () => {
    // complete tracheal rings: uncuffed tubes or cuff left down (Elliott 2014) [published]
    const cautions = collectCautions({ route: 'endotracheal' });
    expect(cautions.map((caution) => caution.code)).toEqual(['uncuffed-tube']);
    expect(cautions[0]?.reason).toMatch(/Elliott 2014/);
    expect(codes({ route: 'mask' })).toEqual([]);
  });

  it('warns when the cuff is inflated', () => {
    expect(codes({ route: 'endotracheal', tubeCuffInflated: true })).toEqual(['cuff-inflated']);
  });

  it('gives the IPPV peak pressure advice and warns above 15 cmH2O', () => {
    // IPPV peak pressure about 10-15 cmH2O [memory]
    const advice = collectCautions({ ventilationMode: 'ippv', ippvPeakPressureCmH2O: 12 });
    expect(advice.map((caution) => caution.code)).toEqual(['ippv-peak-pressure']);
    expect(advice[0]?.reason).toMatch(/unverified value/);
    expect(codes({ ventilationMode: 'ippv', ippvPeakPressureCmH2O: 20 })).toEqual([
      'ippv-peak-pressure-high',
    ]);
    expect(codes({ ventilationMode: 'spontaneous' })).toEqual([]);
  });

  it('passes on the species airway anatomy notes', () => {
    // tracheal bulla in male ducks (Anatidae) [memory]; tracheal loops in cranes [memory]
    const duck = findSpeciesReference('pekin-duck');
    const crane = findSpeciesReference('sandhill-crane');
    expect(codes({ anatomyNotes: duck?.anatomyNotes })).toEqual([
      'anatomy-tracheal-bulla',
      'anatomy-dive-response',
    ]);
    expect(codes({ anatomyNotes: crane?.anatomyNotes })).toEqual(['anatomy-tracheal-loops']);
    expect(codes({ anatomyNotes: findSpeciesReference('budgerigar')?.anatomyNotes })).toEqual([]);
  });
});

describe('order', () => {
  it('puts dangers first, then warnings, then notices', () => {
    const cautions = collectCautions({
      route: 'endotracheal',
      circuit: 'nonRebreathing',
      scavenging: false,
      agent: 'sevoflurane',
      highestDialPct: 30,
      freshGasLpm: 0.2,
      minimumFreshGasLpm: 0.6,
    });
    const severities = cautions.map((caution) => caution.severity);
    expect(severities).toEqual(
      [...severities].sort(
        (a, b) => ['danger', 'warning', 'notice'].indexOf(a) - ['danger', 'warning', 'notice'].indexOf(b),
      ),
    );
    expect(cautions.map((caution) => caution.code)).toEqual([
      'dial-above-saturated',
      'flow-below-rebreathing-minimum',
      'no-scavenging',
      'flow-below-practical-floor',
      'uncuffed-tube',
    ]);
  });

  it('gives every caution a message and a reason', () => {
    const cautions = collectCautions({
      ...budgerigar,
      bodyMassG: 80,
      agent: 'desflurane',
      route: 'chamber',
      chamberExposureMin: 20,
      scavenging: false,
      wasteGasPeakPpm: 5,
      predictedPeakBrainMacMultiple: 2,
      ventilationMode: 'ippv',
    });
    expect(cautions.length).toBeGreaterThanOrEqual(6);
    for (const caution of cautions) {
      expect(caution.message.length, caution.code).toBeGreaterThan(10);
      expect(caution.reason.length, caution.code).toBeGreaterThan(10);
    }
  });
});

describe('species context', () => {
  it('gives the cautions of a species from its reference entry', () => {
    const duck = findSpeciesReference('pekin-duck');
    if (duck === undefined) throw new Error('pekin-duck missing');
    // duck apnoea common above 1.5 MAC (Ludders, Mitchell & Rode 1990, Vet Surg 19); isoflurane MAC published, sevoflurane not
    expect(duck.apnoeaMacMultiple?.value).toBe(1.5);
    const context: CautionContext = {
      speciesName: duck.commonName,
      speciesMassRangeG: duck.typicalMassG,
      anatomyNotes: duck.anatomyNotes,
      ...(duck.apnoeaMacMultiple === undefined ? {} : { apnoeaMacMultiple: duck.apnoeaMacMultiple }),
      macIsPublishedForBird: duck.macByAgent.sevoflurane !== undefined,
    };
    expect(
      codes({ ...context, bodyMassG: 3000, agent: 'sevoflurane', predictedPeakBrainMacMultiple: 1.6 }),
    ).toEqual([
      'apnoea-risk',
      'mac-not-published-for-species',
      'anatomy-tracheal-bulla',
      'anatomy-dive-response',
    ]);
  });
});
