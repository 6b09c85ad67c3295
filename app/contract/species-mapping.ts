import type { AgentId, BasisKind } from '../core/agents.js';
import type { SpeciesReference } from '../core/species-reference.js';
import type { Species } from './records.js';

const agentsWithMac: readonly AgentId[] = ['isoflurane', 'sevoflurane', 'desflurane'];

const kinds: readonly BasisKind[] = [
  'published',
  'derived',
  'memory',
  'assumption',
  'common practice',
  'measured',
  'equation',
];

/**
 * The tag at the end of a stored basis ("... [published]"), as the seed writes it; a value the
 * clinic typed without a tag counts as the clinic's own ('common practice').
 */
export function basisKind(basis: string): BasisKind {
  const tag = /\[([a-z ]+)\]\s*$/.exec(basis)?.[1];
  return kinds.find((kind) => kind === tag) ?? 'common practice';
}

/**
 * The clinic's species record (possibly edited) in the shape the model reads, so a clinic's
 * edit of a MAC or mass range flows into every new plan. Bases keep the clinic's wording.
 */
export function speciesToReference(species: Species): SpeciesReference {
  const values = species.values;
  const macByAgent: SpeciesReference['macByAgent'] = {};
  for (const agent of agentsWithMac) {
    const mac = values.mac[agent];
    if (mac === null) continue;
    macByAgent[agent] = {
      macPct: mac.macPct,
      ...(mac.sdPct === null ? {} : { sdPct: mac.sdPct }),
      measure: mac.measure,
      basis: mac.basis,
      kind: basisKind(mac.basis),
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
      basis: values.massBasis,
      kind: basisKind(values.massBasis),
    },
    ...(values.heartRate === null
      ? {}
      : {
          restingHeartRatePerMin: {
            minPerMin: values.heartRate.min,
            maxPerMin: values.heartRate.max,
            basis: values.heartRate.basis,
            kind: basisKind(values.heartRate.basis),
          },
        }),
    ...(values.breathsPerMin === null
      ? {}
      : {
          restingBreathsPerMin: {
            minPerMin: values.breathsPerMin.min,
            maxPerMin: values.breathsPerMin.max,
            basis: values.breathsPerMin.basis,
            kind: basisKind(values.breathsPerMin.basis),
          },
        }),
    macByAgent,
    ...(values.apnoeaMacMultiple === null
      ? {}
      : {
          apnoeaMacMultiple: {
            value: values.apnoeaMacMultiple.value,
            basis: values.apnoeaMacMultiple.basis,
            kind: basisKind(values.apnoeaMacMultiple.basis),
          },
        }),
    anatomyNotes: values.anatomyNotes.map((note) => ({
      code: note.code,
      text: note.text,
      basis: note.basis,
      kind: basisKind(note.basis),
    })),
  };
}
