/**
 * Physical and pharmacological properties of the inhalant agents.
 *
 * Every value carries its basis and the kind of that basis (see ./sourced.ts).
 */
import type { Sourced } from './sourced.js';

/** The inhalant agents, declared once: the contract's enum and every agent list read this. */
export const agentIds = ['isoflurane', 'sevoflurane', 'desflurane'] as const;
export type AgentId = (typeof agentIds)[number];

export type AgentProperties = {
  readonly id: AgentId;
  readonly displayName: string;
  readonly molecularWeightGPerMol: Sourced<number>;
  readonly liquidDensityGPerMl: Sourced<number>;
  readonly vapourPressureMmHgAt20C: Sourced<number>;
  /** Blood/gas partition coefficient at 37 C (human). No avian measurement was found. */
  readonly bloodGasPartition: Sourced<number>;
  /** Plausible range of the blood/gas coefficient, used by the uncertainty run. */
  readonly bloodGasRange: readonly [number, number];
  /** Tissue/blood partition coefficients (human), assumptions for birds. */
  readonly vesselRichBloodPartition: Sourced<number>;
  readonly muscleBloodPartition: Sourced<number>;
  readonly fatBloodPartition: Sourced<number>;
  /** MAC used when neither the plan nor the species gives one. */
  readonly fallbackMacPct: Sourced<number>;
};

const humanTissueBasis =
  'Human tissue/blood partition coefficient (unverified value; classic uptake-model tables); mammalian value is an assumption for birds';

export const agents: Readonly<Record<AgentId, AgentProperties>> = {
  isoflurane: {
    id: 'isoflurane',
    displayName: 'Isoflurane',
    molecularWeightGPerMol: { value: 184.5, basis: 'Product label (isoflurane)', kind: 'published' },
    liquidDensityGPerMl: { value: 1.496, basis: 'Product label (isoflurane), 20 C', kind: 'published' },
    vapourPressureMmHgAt20C: { value: 238, basis: 'Product label (isoflurane), 20 C', kind: 'published' },
    bloodGasPartition: {
      value: 1.45,
      basis:
        'Human blood/gas 1.45 +/- 0.12 (Anesth Analg 2015;120:45-50); no avian value found: assumption for birds',
      kind: 'published',
    },
    bloodGasRange: [1.21, 1.69],
    vesselRichBloodPartition: { value: 1.6, basis: humanTissueBasis, kind: 'from memory' },
    muscleBloodPartition: { value: 2.9, basis: humanTissueBasis, kind: 'from memory' },
    fatBloodPartition: { value: 45, basis: humanTissueBasis, kind: 'from memory' },
    fallbackMacPct: {
      value: 1.3,
      basis:
        'Assumption: about the mean of published avian isoflurane MAC (duck 1.30, crane 1.34, chicken 1.18, cockatoo 1.44 %)',
      kind: 'assumption',
    },
  },
  sevoflurane: {
    id: 'sevoflurane',
    displayName: 'Sevoflurane',
    molecularWeightGPerMol: { value: 200.05, basis: 'Product label (sevoflurane)', kind: 'published' },
    liquidDensityGPerMl: { value: 1.52, basis: 'Product label (sevoflurane), 20 C', kind: 'published' },
    vapourPressureMmHgAt20C: { value: 157, basis: 'Product label (sevoflurane), 20 C', kind: 'published' },
    bloodGasPartition: {
      value: 0.74,
      basis:
        'Human blood/gas 0.74 +/- 0.06 (Anesth Analg 2015;120:45-50); label 0.65-0.69; no avian value found: assumption for birds',
      kind: 'published',
    },
    bloodGasRange: [0.65, 0.86],
    vesselRichBloodPartition: { value: 1.7, basis: humanTissueBasis, kind: 'from memory' },
    muscleBloodPartition: { value: 3.1, basis: humanTissueBasis, kind: 'from memory' },
    fatBloodPartition: { value: 48, basis: humanTissueBasis, kind: 'from memory' },
    fallbackMacPct: {
      value: 2.3,
      basis:
        'Assumption: about the mean of published avian sevoflurane values (chicken 2.21, thick-billed parrot 2.35, blue-fronted Amazon 2.4 %)',
      kind: 'assumption',
    },
  },
  desflurane: {
    id: 'desflurane',
    displayName: 'Desflurane',
    molecularWeightGPerMol: { value: 168.04, basis: 'Product label (desflurane)', kind: 'published' },
    liquidDensityGPerMl: {
      value: 1.465,
      basis: 'Liquid density of desflurane at 20 C (unverified value)',
      kind: 'from memory',
    },
    vapourPressureMmHgAt20C: { value: 669, basis: 'Product label (desflurane), 20 C', kind: 'published' },
    bloodGasPartition: {
      value: 0.42,
      basis:
        'Human blood/gas 0.42 (published); 0.57 +/- 0.04 in Anesth Analg 2015;120:45-50; no avian value found: assumption for birds',
      kind: 'published',
    },
    bloodGasRange: [0.42, 0.65],
    vesselRichBloodPartition: { value: 1.3, basis: humanTissueBasis, kind: 'from memory' },
    muscleBloodPartition: { value: 2.0, basis: humanTissueBasis, kind: 'from memory' },
    fatBloodPartition: { value: 27, basis: humanTissueBasis, kind: 'from memory' },
    fallbackMacPct: {
      value: 6.0,
      basis:
        'Assumption: no avian desflurane MAC was found; human adult value (unverified value) used until the clinic enters one',
      kind: 'assumption',
    },
  },
};

/** Molar volume of an ideal gas at 20 C and 1 atm, litres per mole (R T / P). */
export const molarVolumeLAt20C = 24.055;

/** Standard atmosphere in mmHg. */
export const standardAtmosphereMmHg = 760;

/** Plain names of the agents, as the screens and the worksheet show them. */
export const agentLabels: Readonly<Record<AgentId, string>> = {
  isoflurane: agents.isoflurane.displayName,
  sevoflurane: agents.sevoflurane.displayName,
  desflurane: agents.desflurane.displayName,
};
