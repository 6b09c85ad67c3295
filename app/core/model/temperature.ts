/**
 * Body temperature: its effect on the agent's solubility and on MAC.
 *
 * Solubility: the logarithm of the blood/gas coefficient rises linearly as temperature falls,
 *   lambda(T) = lambda_37 x exp(k_agent x (37 - T))
 * with k_agent from human blood measured at 17-37 C (Zhou, Liu & Liu, PubMed 12150733). Tissue/gas
 * coefficients rise in proportion to blood/gas, so tissue/blood coefficients do not change with
 * temperature (human tissues, Anesth Analg, July 2001). The human coefficients in app/core/agents.ts are 37 C values; a
 * bird's core is warmer, so a normothermic bird holds a little less agent than they say.
 *
 * MAC: falls linearly with body temperature below the normothermic value at which the avian MACs
 * were measured (studies held their birds at 39.5-41 C):
 *   MAC(T) = MAC_normal x max(0.3, 1 - m x (T_normal - T))
 * with m from isoflurane MAC in children at 37, 34 and 31 C (Anesthesiology 2001, 94:429-432); no avian figure
 * was found, so m is an assumption for birds. Above the normothermic value MAC is left unchanged.
 * The anaesthetic index (apnoea / MAC) did not change with hypothermia in dogs (Regan & Eger
 * 1967, from memory: the abstract read names no authors), so the depression rule, written in MAC multiples, follows the corrected MAC.
 */
import type { AgentId } from '../agents.js';
import type { ModelParameter } from './parameters.js';

/** Temperature at which the agents' partition coefficients (app/core/agents.ts) were measured, C. */
export const partitionReferenceTemperatureC = 37;

/**
 * Rise of ln(blood/gas) per 1 C fall of temperature, by agent (human blood, 17-37 C, haematocrit
 * term aside).
 */
export const solubilityTemperatureCoefficient: Readonly<Record<AgentId, ModelParameter>> = {
  isoflurane: {
    value: 0.0382,
    range: [0.0263, 0.0382],
    basis:
      'Human blood: ln(blood/gas) = -0.0382 x T + 0.0154 x Hct + 1.120 (Zhou J., Liu Y., Liu J., 17-37 C, PubMed 12150733); horse blood -2.63 +/- 0.13 % per 1 C (Bergadano et al. 2003, Br J Anaesth 91:276) as the low end; no avian measurement found (assumption for birds)',
    kind: 'published',
  },
  sevoflurane: {
    value: 0.0295,
    range: [0.0236, 0.0354],
    basis:
      'Human blood: ln(blood/gas) = -0.0295 x T + 0.0092 x Hct + 0.306 (Zhou J., Liu Y., Liu J., 17-37 C, PubMed 12150733); range +/-20 % (assumption); no avian measurement found (assumption for birds)',
    kind: 'published',
  },
  desflurane: {
    value: 0.0302,
    range: [0.0242, 0.0362],
    basis:
      'Human blood: ln(blood/gas) = -0.0302 x T + 0.0094 x Hct + 0.119 (Zhou J., Liu Y., Liu J., 17-37 C, PubMed 12150733); range +/-20 % (assumption); no avian measurement found (assumption for birds)',
    kind: 'published',
  },
};

/** Normal (normothermic) avian core temperature, at which the published avian MACs were measured, C. */
export const avianNormalBodyTemperatureC: ModelParameter = {
  value: 41,
  range: [40, 42],
  basis:
    'Awake pigeons 41.8 +/- 0.5 C cloacal (Vet Anaesth Analg 2016, 43:63-71); MAC studies held chickens at 39.5-41.0 C (Naganobu et al. 2000, Vet Surg 29:102-105) and sandhill cranes at 40 +/- 0.5 C (Ludders et al. 1989); 41 C taken for every species (assumption)',
  kind: 'assumption',
};

/** Fall of MAC per 1 C below the normothermic temperature, as a fraction of the normothermic MAC. */
export const macTemperatureCoefficient: ModelParameter = {
  value: 0.051,
  range: [0.02, 0.051],
  basis:
    'Isoflurane MAC in children 1.69, 1.47, 1.22 % at 37, 34, 31 C: 5.1 % per 1 C (The effect of hypothermia on isoflurane MAC in children, Anesthesiology 2001, 94:429-432); 2-5 % per 1 C across agents in mammals (textbook summary of animal data); no avian figure found: assumption for birds',
  kind: 'assumption',
};

/** Lowest and highest body temperature a plan may state, C (the plan schema enforces these). */
export const bodyTemperatureLimitsC = { minC: 30, maxC: 44 } as const;

/**
 * Multiplier of the blood/gas (and every tissue/gas) coefficient at a body temperature.
 * @param agent agent
 * @param bodyTemperatureC body temperature, C (30-44)
 * @param coefficient rise of ln(lambda) per 1 C fall (defaults to the agent's published value)
 */
export function solubilityTemperatureFactor(
  agent: AgentId,
  bodyTemperatureC: number,
  coefficient: number = solubilityTemperatureCoefficient[agent].value,
): number {
  return Math.exp(coefficient * (partitionReferenceTemperatureC - bodyTemperatureC));
}

/**
 * Multiplier of the normothermic MAC at a body temperature (1 at or above the normal value).
 * @param bodyTemperatureC body temperature, C (30-44)
 * @param normalC normothermic temperature of the MAC, C
 * @param coefficient fall of MAC per 1 C, fraction of MAC
 */
export function macTemperatureFactor(
  bodyTemperatureC: number,
  normalC: number = avianNormalBodyTemperatureC.value,
  coefficient: number = macTemperatureCoefficient.value,
): number {
  if (bodyTemperatureC >= normalC) return 1;
  return Math.max(0.3, 1 - coefficient * (normalC - bodyTemperatureC));
}
