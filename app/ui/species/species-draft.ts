import type { SpeciesValues } from '../../contract/records.js';
import type { AgentId } from '../../core/agents.js';
import type { PotencyMeasure } from '../../core/species-reference.js';
import { displayBasis } from '../common/display.js';

/** What the species form holds: numbers as typed, so partial input is never lost. */
export type MacDraft = {
  macPct: string;
  sdPct: string;
  measure: PotencyMeasure;
  basis: string;
  note: string;
};
export type RangeDraft = { min: string; max: string; basis: string };

export type SpeciesDraft = {
  commonName: string;
  scientificName: string;
  massMinG: string;
  massMaxG: string;
  massBasis: string;
  heartRate: RangeDraft;
  breathsPerMin: RangeDraft;
  mac: Record<AgentId, MacDraft>;
  apnoeaValue: string;
  apnoeaBasis: string;
  anatomyNotes: { code: string; text: string; basis: string }[];
};

const text = (value: number | null | undefined) =>
  value === null || value === undefined ? '' : String(value);
const emptyMac = (): MacDraft => ({ macPct: '', sdPct: '', measure: 'MAC', basis: '', note: '' });
const emptyRange = (): RangeDraft => ({ min: '', max: '', basis: '' });

export const emptySpeciesDraft = (): SpeciesDraft => ({
  commonName: '',
  scientificName: '',
  massMinG: '',
  massMaxG: '',
  massBasis: '',
  heartRate: emptyRange(),
  breathsPerMin: emptyRange(),
  mac: { isoflurane: emptyMac(), sevoflurane: emptyMac(), desflurane: emptyMac() },
  apnoeaValue: '',
  apnoeaBasis: '',
  anatomyNotes: [],
});

export function speciesToDraft(values: SpeciesValues): SpeciesDraft {
  const mac = (agent: AgentId): MacDraft => {
    const value = values.mac[agent];
    return value === null
      ? emptyMac()
      : {
          macPct: text(value.macPct),
          sdPct: text(value.sdPct),
          measure: value.measure,
          basis: displayBasis(value.basis),
          note: value.note ?? '',
        };
  };
  const range = (value: SpeciesValues['heartRate']): RangeDraft =>
    value === null
      ? emptyRange()
      : { min: text(value.min), max: text(value.max), basis: displayBasis(value.basis) };
  return {
    commonName: values.commonName,
    scientificName: values.scientificName,
    massMinG: text(values.massMinG),
    massMaxG: text(values.massMaxG),
    massBasis: displayBasis(values.massBasis),
    heartRate: range(values.heartRate),
    breathsPerMin: range(values.breathsPerMin),
    mac: { isoflurane: mac('isoflurane'), sevoflurane: mac('sevoflurane'), desflurane: mac('desflurane') },
    apnoeaValue: text(values.apnoeaMacMultiple?.value),
    apnoeaBasis: values.apnoeaMacMultiple === null ? '' : displayBasis(values.apnoeaMacMultiple.basis),
    anatomyNotes: values.anatomyNotes.map((note) => ({ ...note, basis: displayBasis(note.basis) })),
  };
}

function numberOrText(value: string): number | string | undefined {
  const trimmed = value.trim().replace(',', '.');
  if (trimmed === '') return undefined;
  const parsed = Number(trimmed);
  return Number.isFinite(parsed) ? parsed : value;
}

/**
 * The form's values in the contract's shape, for the contract's schema to judge. An optional
 * group (a MAC, a rate range) left wholly blank becomes null; a half-filled one is passed on so
 * the schema names what is missing.
 */
export function draftToCandidate(draft: SpeciesDraft): unknown {
  const mac = (value: MacDraft) =>
    value.macPct.trim() === '' && value.basis.trim() === ''
      ? null
      : {
          macPct: numberOrText(value.macPct),
          sdPct: value.sdPct.trim() === '' ? null : numberOrText(value.sdPct),
          measure: value.measure,
          basis: value.basis,
          note: value.note.trim() === '' ? null : value.note,
        };
  const range = (value: RangeDraft) =>
    value.min.trim() === '' && value.max.trim() === '' && value.basis.trim() === ''
      ? null
      : { min: numberOrText(value.min), max: numberOrText(value.max), basis: value.basis };
  return {
    commonName: draft.commonName,
    scientificName: draft.scientificName,
    massMinG: numberOrText(draft.massMinG),
    massMaxG: numberOrText(draft.massMaxG),
    massBasis: draft.massBasis,
    heartRate: range(draft.heartRate),
    breathsPerMin: range(draft.breathsPerMin),
    mac: {
      isoflurane: mac(draft.mac.isoflurane),
      sevoflurane: mac(draft.mac.sevoflurane),
      desflurane: mac(draft.mac.desflurane),
    },
    apnoeaMacMultiple:
      draft.apnoeaValue.trim() === '' && draft.apnoeaBasis.trim() === ''
        ? null
        : { value: numberOrText(draft.apnoeaValue), basis: draft.apnoeaBasis },
    anatomyNotes: draft.anatomyNotes.filter((note) => note.text.trim() !== '' || note.basis.trim() !== ''),
  };
}
