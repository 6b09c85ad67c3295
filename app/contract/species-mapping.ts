import { agentIds } from '../core/agents.js';
import type { SpeciesReference } from '../core/species-reference.js';
import { readBasis } from '../core/sourced.js';
import type { Species } from './records.js';

/**
 * The clinic's species record (possibly edited) in the shape the model reads, so a clinic's
 * edit of a MAC or mass range flows into every new plan. Bases keep the clinic's wording; the kind is
 * read from the tag at the end of each stored basis (see readBasis).
 */
export function speciesToReference(species: Species): SpeciesReference {
  const values = species.values;
  const macByAgent: SpeciesReference['macByAgent'] = {};
  for (const agent of agentIds) {
    const mac = values.mac[agent];
    if (mac === null) continue;
    macByAgent[agent] = {
      macPct: mac.macPct,
      ...(mac.sdPct === null ? {} : { sdPct: mac.sdPct }),
      measure: mac.measure,
      ...readBasis(mac.basis),
      ...(mac.note === null ? {} : { note: mac.note }),
    };
  }
  return {
    id: species.key,
    commonName: values.commonName,
    scientificName: values.scientificName,
    typicalMassG: {
      minG: values.massMinG,
      maxG: values.massMaxG,
      ...readBasis(values.massBasis),
    },
    ...(values.heartRate === null
      ? {}
      : {
          restingHeartRatePerMin: {
            minPerMin: values.heartRate.min,
            maxPerMin: values.heartRate.max,
            ...readBasis(values.heartRate.basis),
          },
        }),
    ...(values.breathsPerMin === null
      ? {}
      : {
          restingBreathsPerMin: {
            minPerMin: values.breathsPerMin.min,
            maxPerMin: values.breathsPerMin.max,
            ...readBasis(values.breathsPerMin.basis),
          },
        }),
    macByAgent,
    ...(values.apnoeaMacMultiple === null
      ? {}
      : {
          apnoeaMacMultiple: {
            value: values.apnoeaMacMultiple.value,
            ...readBasis(values.apnoeaMacMultiple.basis),
          },
        }),
    anatomyNotes: values.anatomyNotes.map((note) => ({
      code: note.code,
      text: note.text,
      ...readBasis(note.basis),
    })),
  };
}
