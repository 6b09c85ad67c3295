/**
 * Calibration on the clinic's own records: a three-level normal hierarchical model of the log
 * ratio observed / predicted, fitted per milestone (docs/evidence.md has the equations).
 *
 *   y_ij ~ N(theta_i, sigma^2)      record j of species i (bird-to-bird spread sigma)
 *   theta_i ~ N(mu_g, tau_s^2)      species i within its group g
 *   mu_g ~ N(mu, tau_g^2)           group within the clinic
 *   mu ~ N(0, tau_0^2)              the clinic's offset from the population model
 *
 * With the spreads fixed, the posterior is Gaussian and is computed exactly by one pass up the
 * tree (each level's data summarised as a precision-weighted mean) and one pass down
 * (normal-normal shrinkage, conditioning on the level above and integrating it out): Gelman et
 * al., Bayesian Data Analysis, 3rd ed. 2013, ch. 5 (5.4, the hierarchical normal model with
 * known variances); shrinkage as in Efron & Morris 1975, JASA 70:311-319. sigma is estimated
 * from the pooled within-species spread with a scaled inverse-chi-square prior (BDA ch. 3.3).
 * Pure and deterministic.
 */
import { speciesGroupOf, type SpeciesGroupId } from './species-groups.js';

/** The prior spreads on the log scale, with their basis. */
export type CalibrationPrior = {
  /** How far the population model may be off for the whole clinic, tau_0. */
  readonly clinicSd: number;
  /** How far a group of species may differ from the clinic, tau_g. */
  readonly groupSd: number;
  /** How far a species may differ from its group, tau_s. */
  readonly speciesSd: number;
  /** Prior guess of the bird-to-bird spread within a species, sigma_0. */
  readonly birdSd: number;
  /** Weight of that guess, in records (degrees of freedom nu_0). */
  readonly birdSdWeight: number;
  readonly basis: string;
};

/**
 * The prior. The validation against published birds (docs/validation.md, model 2.0.0) has 11
 * log ratios model / published with a root mean square of 0.52 about 0: the population model is
 * off by about x1.7 for one species' published group. That total is split over the three
 * levels, tau_0 = 0.40, tau_g = 0.25, tau_s = 0.15 (sqrt of the sum of squares 0.50; the split is
 * an assumption: most of the misfit is taken to be shared by every bird of a clinic, the model's
 * structure and the clinic's way of working, less between orders, least between related species). The bird-to-bird spread: the published groups' SD / mean is 0.21-0.28 (Botman
 * 2016 0.28 and 0.27, Langlois 2003 0.26, Chemonges 2014 0.21) under study conditions; a clinic's
 * mixed procedures and minute-rounded times are assumed wider, sigma_0 = 0.35 with the weight of
 * 6 records (assumption).
 */
export const calibrationPrior: CalibrationPrior = {
  clinicSd: 0.4,
  groupSd: 0.25,
  speciesSd: 0.15,
  birdSd: 0.35,
  birdSdWeight: 6,
  basis:
    'Prior: the population model may be off by about x1.65 (log SD 0.50, from the root mean square 0.52 of the 11 validation log ratios, docs/validation.md), split over clinic 0.40, species group 0.25 and species 0.15 (assumption); bird-to-bird log SD 0.35 with the weight of 6 records (published groups 0.21-0.28, widened for clinic conditions: assumption)',
};

/** z of the two-sided 90 % normal interval, 1.6449 (standard normal quantile 0.95). */
export const z90 = 1.6448536269514722;

export type CalibrationObservation = {
  readonly speciesId: string;
  /** ln(observed / predicted). */
  readonly logRatio: number;
};

export type Posterior = {
  /** Posterior mean of the log ratio. */
  readonly mean: number;
  /** Posterior SD of the log ratio. */
  readonly sd: number;
  /** Records it rests on directly (the species', the group's, the clinic's). */
  readonly records: number;
};

export type MilestoneFit = {
  readonly clinic: Posterior;
  readonly groups: ReadonlyMap<SpeciesGroupId, Posterior>;
  readonly species: ReadonlyMap<string, Posterior>;
  /** Bird-to-bird log SD used (the prior's updated by the pooled within-species spread). */
  readonly birdSd: number;
  readonly records: number;
};

type Summary = { mean: number; variance: number; records: number };

/** Precision-weighted combination of independent normal estimates of one mean. */
function combine(parts: readonly { mean: number; variance: number; records: number }[]): Summary | null {
  let precision = 0;
  let weighted = 0;
  let records = 0;
  for (const part of parts) {
    precision += 1 / part.variance;
    weighted += part.mean / part.variance;
    records += part.records;
  }
  return precision === 0 ? null : { mean: weighted / precision, variance: 1 / precision, records };
}

/**
 * The normal-normal posterior of a mean with prior N(priorMean, priorVariance) and data
 * summarised as N(dataMean, dataVariance): BDA 3rd ed. eq. 2.12 (precision-weighted).
 * @returns posterior mean and variance
 */
export function normalNormal(
  priorMean: number,
  priorVariance: number,
  dataMean: number,
  dataVariance: number,
): { mean: number; variance: number } {
  const precision = 1 / priorVariance + 1 / dataVariance;
  return { mean: (priorMean / priorVariance + dataMean / dataVariance) / precision, variance: 1 / precision };
}

/**
 * A child's posterior given its own data summary and its parent's posterior N(m, v), with
 * child ~ N(parent, spread^2): condition on the parent (normal-normal), then integrate it out.
 * Without data the child is N(m, v + spread^2).
 */
function downward(parent: { mean: number; variance: number }, spread: number, data: Summary | null) {
  const spread2 = spread * spread;
  if (data === null) return { mean: parent.mean, variance: parent.variance + spread2 };
  // B: the share of the estimate that comes from the parent (shrinkage factor).
  const shrink = data.variance / (data.variance + spread2);
  const conditionalVariance = 1 / (1 / spread2 + 1 / data.variance);
  return {
    mean: shrink * parent.mean + (1 - shrink) * data.mean,
    variance: conditionalVariance + shrink * shrink * parent.variance,
  };
}

/**
 * Fits one milestone's calibration.
 * @param observations one log ratio per record (finite)
 * @param prior the spreads
 * @param groupOf the group of a species (the trade's orders by default)
 */
export function fitMilestone(
  observations: readonly CalibrationObservation[],
  prior: CalibrationPrior = calibrationPrior,
  groupOf: (speciesId: string) => SpeciesGroupId = speciesGroupOf,
): MilestoneFit {
  const bySpecies = new Map<string, number[]>();
  for (const observation of observations) {
    if (!Number.isFinite(observation.logRatio)) continue;
    const list = bySpecies.get(observation.speciesId) ?? [];
    list.push(observation.logRatio);
    bySpecies.set(observation.speciesId, list);
  }
  // Bird-to-bird spread: pooled within-species sum of squares with the prior's weight.
  let squares = 0;
  let degrees = 0;
  const means = new Map<string, number>();
  for (const [species, values] of bySpecies) {
    const mean = values.reduce((sum, value) => sum + value, 0) / values.length;
    means.set(species, mean);
    for (const value of values) squares += (value - mean) ** 2;
    degrees += values.length - 1;
  }
  const birdVariance =
    (prior.birdSdWeight * prior.birdSd * prior.birdSd + squares) / (prior.birdSdWeight + degrees);

  // Upward: species means -> each group's estimate of its mean -> the clinic's.
  const speciesData = new Map<string, Summary>();
  for (const [species, values] of bySpecies)
    speciesData.set(species, {
      mean: means.get(species) as number,
      variance: birdVariance / values.length,
      records: values.length,
    });
  const groupParts = new Map<SpeciesGroupId, Summary[]>();
  for (const [species, data] of speciesData) {
    const group = groupOf(species);
    const parts = groupParts.get(group) ?? [];
    parts.push({ ...data, variance: data.variance + prior.speciesSd ** 2 });
    groupParts.set(group, parts);
  }
  const groupData = new Map<SpeciesGroupId, Summary>();
  for (const [group, parts] of groupParts) groupData.set(group, combine(parts) as Summary);
  const clinicData = combine(
    [...groupData.values()].map((data) => ({ ...data, variance: data.variance + prior.groupSd ** 2 })),
  );

  // The clinic's offset: the prior N(0, tau_0^2) and the groups' evidence.
  const clinic =
    clinicData === null
      ? { mean: 0, variance: prior.clinicSd ** 2 }
      : normalNormal(0, prior.clinicSd ** 2, clinicData.mean, clinicData.variance);
  const groups = new Map<SpeciesGroupId, Posterior>();
  const groupPosteriors = new Map<SpeciesGroupId, { mean: number; variance: number }>();
  for (const [group, data] of groupData) {
    const posterior = downward(clinic, prior.groupSd, data);
    groupPosteriors.set(group, posterior);
    groups.set(group, { mean: posterior.mean, sd: Math.sqrt(posterior.variance), records: data.records });
  }
  const species = new Map<string, Posterior>();
  for (const [id, data] of speciesData) {
    const parent = groupPosteriors.get(groupOf(id)) as { mean: number; variance: number };
    const posterior = downward(parent, prior.speciesSd, data);
    species.set(id, { mean: posterior.mean, sd: Math.sqrt(posterior.variance), records: data.records });
  }
  return {
    clinic: { mean: clinic.mean, sd: Math.sqrt(clinic.variance), records: clinicData?.records ?? 0 },
    groups,
    species,
    birdSd: Math.sqrt(birdVariance),
    records: clinicData?.records ?? 0,
  };
}

export type SpeciesCalibration = {
  /** exp(posterior mean): multiply the population prediction by this. */
  readonly factor: number;
  /** 90 % band of the factor (the clinic's typical bird of the species). */
  readonly band90: { readonly low: number; readonly high: number };
  /** 90 % band for the next bird (adds the bird-to-bird spread). */
  readonly birdBand90: { readonly low: number; readonly high: number };
  readonly mean: number;
  readonly sd: number;
  /** Records of this species it rests on. */
  readonly speciesRecords: number;
  /** Records of the species' group. */
  readonly groupRecords: number;
  /** Records of the whole clinic for this milestone. */
  readonly clinicRecords: number;
};

/**
 * The calibration of a species (also one with no records: it follows its group, then the clinic).
 * @param fit a milestone's fit
 * @param speciesId the species key
 * @param prior the spreads used for the fit
 * @param groupOf the group of a species
 */
export function speciesCalibration(
  fit: MilestoneFit,
  speciesId: string,
  prior: CalibrationPrior = calibrationPrior,
  groupOf: (speciesId: string) => SpeciesGroupId = speciesGroupOf,
): SpeciesCalibration {
  const group = groupOf(speciesId);
  const own = fit.species.get(speciesId);
  const groupPosterior = fit.groups.get(group);
  let mean: number;
  let variance: number;
  if (own !== undefined) {
    mean = own.mean;
    variance = own.sd ** 2;
  } else if (groupPosterior !== undefined) {
    mean = groupPosterior.mean;
    variance = groupPosterior.sd ** 2 + prior.speciesSd ** 2;
  } else {
    mean = fit.clinic.mean;
    variance = fit.clinic.sd ** 2 + prior.groupSd ** 2 + prior.speciesSd ** 2;
  }
  const sd = Math.sqrt(variance);
  const birdSd = Math.sqrt(variance + fit.birdSd ** 2);
  return {
    factor: Math.exp(mean),
    band90: { low: Math.exp(mean - z90 * sd), high: Math.exp(mean + z90 * sd) },
    birdBand90: { low: Math.exp(mean - z90 * birdSd), high: Math.exp(mean + z90 * birdSd) },
    mean,
    sd,
    speciesRecords: own?.records ?? 0,
    groupRecords: groupPosterior?.records ?? 0,
    clinicRecords: fit.records,
  };
}
