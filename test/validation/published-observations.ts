/**
 * Published whole-bird induction and recovery observations under isoflurane or sevoflurane, the
 * table `npm run validate` and test/validation/validation.test.ts run through the product's own
 * plan code. Every number is read from the page named in `readFrom` (most are abstracts: the
 * full texts were not available to read here); every setting the source did not give is filled
 * with a stated assumption in `assumptions`, never silently.
 *
 * Split: rows of Deori et al. 2017 and Klaphake et al. 2006 are the FIT set (any future fitting of
 * model parameters may use them); rows of Botman et al. 2016, Langlois et al. 2003 and Chemonges
 * 2014 are the JUDGE set (never used for fitting; they say whether a fit generalises to other
 * species, the other agent and other endpoints). The split is by paper so that a fit cannot learn
 * a paper's own protocol and be judged on it.
 */
import type { AgentId } from '../../app/core/agents.js';

/**
 * What the authors timed. The runner maps each kind onto a model milestone in one place
 * (`endpointMilestones` in validation-runner.ts).
 */
export type EndpointKind =
  /** Induction time with no definition in the text read (e.g. "induction time"). */
  | 'inductionUnspecified'
  /** From the start of delivery to tracheal intubation. */
  | 'intubation'
  /** Recovery time with no definition in the text read, timed from the vaporiser off. */
  | 'recoveryUnspecified'
  /** First somatic reflex or movement after the vaporiser is off (e.g. body jerk). */
  | 'firstMovement';

export type ValidationSplit = 'fit' | 'judge';

/** One vaporiser step as the study ran it (minutes from the start of delivery). */
export type StudyStep = { readonly atMin: number; readonly vaporPct: number };

export type PublishedObservation = {
  /** Stable kebab-case id; tests and docs refer to it. */
  readonly id: string;
  readonly split: ValidationSplit;
  /** Short source name used beside check values, e.g. "Deori et al. 2017". */
  readonly source: string;
  /** Full citation. */
  readonly citation: string;
  /** Where each number was read: page address and part (abstract, table). */
  readonly readFrom: string;
  readonly species: string;
  /** Species row of app/core/species-reference.ts, when the species is there. */
  readonly speciesId?: string;
  /** MAC given to the plan when the species row has none for this agent, with its basis. */
  readonly macPct?: { readonly value: number; readonly basis: string };
  readonly bodyMassG: { readonly value: number; readonly basis: string };
  readonly agent: AgentId;
  /** Route as the plan runs it (one route per plan today). */
  readonly route: 'mask' | 'endotracheal';
  /** The study's route in its own words (mask, then tube, chamber...). */
  readonly studyRoute: string;
  readonly freshGasLpm: { readonly value: number; readonly basis: string };
  readonly schedule: readonly StudyStep[];
  readonly premedication: string;
  readonly endpoint: EndpointKind;
  /** The authors' endpoint in their words, or "not defined in the text read". */
  readonly endpointDefinition: string;
  readonly observedMin: number;
  /** The spread as published, in minutes. */
  readonly spread: {
    readonly kind: 'SD' | 'SE' | 'SD or SE (not stated)' | 'range';
    readonly valueMin: number;
  };
  readonly n: number;
  /** Settings the source did not give, and what the row uses instead. */
  readonly assumptions: readonly string[];
};

const deoriCitation =
  'Deori P., Sarma K.K., Nath P.J., Singh C.K., Nath R. (2017) Physiological alteration, quality of anesthesia and economy of isoflurane in domestic chickens (Gallus domesticus). Veterinary World 10(5):493-497. doi:10.14202/vetworld.2017.493-497';
const deoriReadFrom =
  'Abstract: http://www.veterinaryworld.org/Vol.10/May-2017/4.html (methods) and https://discovery.researcher.life/article/physiological-alteration-quality-of-anesthesia-and-economy-of-isoflurane-in-domestic-chickens-gallus-domesticus/e39900b3de0f3a46b33eb1628ecf2ef9 (results)';
const deoriMass = {
  value: 1800,
  basis:
    'Assumption: body mass is not given in the abstract; 1.8 kg for an adult domestic hen (published studies of hens report 1-1.5 kg (Carregaro et al.) and 1.6-3.4 kg (Naganobu et al. 2000))',
};
const deoriFlow = {
  value: 1,
  basis: 'Assumption: fresh gas flow is not given in the abstract; 1 L/min oxygen',
};
const deoriAssumptions = [
  'Body mass and fresh gas flow are not in the abstract (see bodyMassG and freshGasLpm)',
  'The abstract gives no definition of induction or recovery time',
  'The spread is "±" without saying SD or SE; with n = 6 and these small values it is probably SE',
];
const deoriPremedication = 'None stated in the abstract';

function deoriInduction(
  id: string,
  split: ValidationSplit,
  group: string,
  dialPct: number,
  observedMin: number,
  spreadMin: number,
): PublishedObservation {
  return {
    id,
    split,
    source: 'Deori et al. 2017',
    citation: deoriCitation,
    readFrom: deoriReadFrom,
    species: 'Domestic chicken (Gallus domesticus), adult',
    speciesId: 'chicken',
    bodyMassG: deoriMass,
    agent: 'isoflurane',
    route: 'mask',
    studyRoute: `Mask induction at ${String(dialPct)} % (group ${group}), then endotracheal tube`,
    freshGasLpm: deoriFlow,
    schedule: [{ atMin: 0, vaporPct: dialPct }],
    premedication: deoriPremedication,
    endpoint: 'inductionUnspecified',
    endpointDefinition: 'Induction time (not defined in the text read)',
    observedMin,
    spread: { kind: 'SD or SE (not stated)', valueMin: spreadMin },
    n: 6,
    assumptions: deoriAssumptions,
  };
}

function deoriRecovery(
  id: string,
  split: ValidationSplit,
  group: string,
  inductionDialPct: number,
  inductionMin: number,
  maintenanceDialPct: number,
  observedMin: number,
  spreadMin: number,
): PublishedObservation {
  return {
    id,
    split,
    source: 'Deori et al. 2017',
    citation: deoriCitation,
    readFrom: deoriReadFrom,
    species: 'Domestic chicken (Gallus domesticus), adult',
    speciesId: 'chicken',
    bodyMassG: deoriMass,
    agent: 'isoflurane',
    route: 'endotracheal',
    studyRoute: `Mask induction at ${String(inductionDialPct)} %, then endotracheal tube at ${String(maintenanceDialPct)} % for the 60-min study (group ${group})`,
    freshGasLpm: deoriFlow,
    // The plan runs one route: the induction dial on the tube until the group's published induction
    // time, then maintenance for 60 min (the study's 60-min observation period).
    schedule: [
      { atMin: 0, vaporPct: inductionDialPct },
      { atMin: inductionMin, vaporPct: maintenanceDialPct },
      { atMin: inductionMin + 60, vaporPct: 0 },
    ],
    premedication: deoriPremedication,
    endpoint: 'recoveryUnspecified',
    endpointDefinition: 'Recovery time (not defined in the text read), taken as timed from the vaporiser off',
    observedMin,
    spread: { kind: 'SD or SE (not stated)', valueMin: spreadMin },
    n: 6,
    assumptions: [
      ...deoriAssumptions,
      'Mask induction then tube: the plan has one route, so the induction dial runs on the tube until the published induction time (phased plans will remove this)',
      'Maintenance lasts 60 min after induction (the abstract records parameters from 0 to 60 min and gives the isoflurane used over 60 min)',
      'Recovery time in the abstract has no unit; minutes are assumed (induction times in the same sentence are in min)',
    ],
  };
}

const botmanCitation =
  'Botman J. et al. (2016) Anaesthesia with sevoflurane in pigeons: minimal anaesthetic concentration (MAC) determination and investigation of cardiorespiratory variables at 1 MAC. Veterinary Record, issue of 28 May 2016 (Vet Rec 178(22)); full author list and pages not read here';
const botmanReadFrom =
  'Abstract: https://insights.ovid.com/tvre/201605280/00008049-201605280-00024 (also https://staging.scite.ai/authors/julie-botman-KgP91J)';
const botmanMass = {
  value: 300,
  basis:
    'Assumption: body mass is not given in the abstract; 300 g, about the mean of the pigeons of the Iranian J Vet Med 2015 isoflurane study (302.5 ± 37.95 g)',
};
const botmanMac = {
  value: 3.0,
  basis: 'Botman et al. 2016: sevoflurane MAC in these pigeons 3.0 ± 0.6 % (abstract)',
};
const botmanFlow = { value: 1, basis: 'Assumption: fresh gas flow is not given in the abstract; 1 L/min' };

const langloisCitation =
  'Langlois I., Harvey R.C., Jones M.P., Schumacher J. (2003) Cardiopulmonary and anesthetic effects of isoflurane and propofol in Hispaniolan Amazon parrots (Amazona ventralis). Journal of Avian Medicine and Surgery 17(1):4- (first page from the DOI; last page not read). doi:10.1647/1082-6742(2003)017[0004:CAAEOI]2.0.CO;2';
const klaphakeCitation =
  "Klaphake E., Schumacher J., Greenacre C., Jones M.P., Zagaya N. (2006) Comparative anesthetic and cardiopulmonary effects of pre- versus postoperative butorphanol administration in Hispaniolan Amazon parrots (Amazona ventralis) anesthetized with sevoflurane. Journal of Avian Medicine and Surgery 20(1):2-7. doi:10.1647/1082-6742(2006)20[2:CAACEO]2.0.CO;2 (numbers from the same group's AAZV 2004 conference abstract)";
const amazonMass = {
  value: 280,
  basis:
    'Assumption (from memory): body mass is not given in the abstract; about 280 g for an adult Hispaniolan Amazon parrot',
};
const chemongesCitation =
  'Chemonges S. (2014) Effect of intermittent positive pressure ventilation on depth of anaesthesia during and after isoflurane anaesthesia in sulphur-crested cockatoos (Cacatua galerita galerita). Veterinary Medicine International 2014:250523. doi:10.1155/2014/250523';

/** The validation table. Order is the order of the printout and of the chart legend. */
export const publishedObservations: readonly PublishedObservation[] = [
  deoriInduction('deori-2017-chicken-iso-3.5-induction', 'fit', 'I', 3.5, 5.83, 0.33),
  deoriInduction('deori-2017-chicken-iso-4-induction', 'fit', 'II', 4, 2.37, 0.18),
  deoriInduction('deori-2017-chicken-iso-5-induction', 'fit', 'III', 5, 0.87, 0.15),
  deoriRecovery('deori-2017-chicken-iso-1.5-recovery', 'fit', 'I', 3.5, 5.83, 1.5, 15.33, 0.84),
  deoriRecovery('deori-2017-chicken-iso-2-recovery', 'fit', 'II', 4, 2.37, 2, 18.83, 0.94),
  deoriRecovery('deori-2017-chicken-iso-2.5-recovery', 'fit', 'III', 5, 0.87, 2.5, 26.5, 0.85),
  {
    id: 'klaphake-2006-amazon-sevo-induction',
    split: 'fit',
    source: 'Klaphake et al. 2006',
    citation: klaphakeCitation,
    readFrom:
      'AAZV 2004 conference abstract: https://www.vin.com/doc/?id=10085104&meta=generic (induction times); journal abstract https://complete.bioone.org/journals/journal-of-avian-medicine-and-surgery/volume-20/issue-1',
    species: 'Hispaniolan Amazon parrot (Amazona ventralis), adult',
    bodyMassG: amazonMass,
    agent: 'sevoflurane',
    route: 'mask',
    studyRoute: 'Face mask induction in 100 % oxygen, then intubated and maintained 40 min',
    freshGasLpm: { value: 1, basis: 'Assumption: fresh gas flow is not given in the abstract; 1 L/min' },
    schedule: [{ atMin: 0, vaporPct: 8 }],
    premedication:
      'None before induction in this group (butorphanol 2 mg/kg IM was given only after anaesthesia)',
    endpoint: 'inductionUnspecified',
    endpointDefinition: 'Time to induction of anaesthesia (not defined in the text read)',
    observedMin: 38 / 60,
    spread: { kind: 'SD or SE (not stated)', valueMin: 8 / 60 },
    n: 11,
    assumptions: [
      'Dial not given in the abstract: 8 % (the sevoflurane vaporiser maximum, a common fast mask induction)',
      'Body mass and flow not given in the abstract',
      'No Hispaniolan Amazon row in the species reference: the agent default MAC is used',
    ],
  },
  {
    id: 'botman-2016-pigeon-sevo-intubation',
    split: 'judge',
    source: 'Botman et al. 2016',
    citation: botmanCitation,
    readFrom: botmanReadFrom,
    species: 'Domestic pigeon (Columba livia), adult',
    speciesId: 'domestic-pigeon',
    macPct: botmanMac,
    bodyMassG: botmanMass,
    agent: 'sevoflurane',
    route: 'mask',
    studyRoute:
      'Induction with sevoflurane in oxygen, then tracheal intubation (route of induction not in the abstract)',
    freshGasLpm: botmanFlow,
    schedule: [{ atMin: 0, vaporPct: 8 }],
    premedication: 'None stated in the abstract',
    endpoint: 'intubation',
    endpointDefinition: 'Time to tracheal intubation',
    observedMin: 2.5,
    spread: { kind: 'SD or SE (not stated)', valueMin: 0.7 },
    n: 7,
    assumptions: [
      'Induction route and dial not given in the abstract: mask at 8 % (the sevoflurane vaporiser maximum)',
      'Body mass and flow not given in the abstract',
    ],
  },
  {
    id: 'botman-2016-pigeon-sevo-recovery',
    split: 'judge',
    source: 'Botman et al. 2016',
    citation: botmanCitation,
    readFrom: botmanReadFrom,
    species: 'Domestic pigeon (Columba livia), adult',
    speciesId: 'domestic-pigeon',
    macPct: botmanMac,
    bodyMassG: botmanMass,
    agent: 'sevoflurane',
    route: 'endotracheal',
    studyRoute: 'Intubated; MAC bracketing, then 40 min at 1.0 MAC (end-tidal 3.0 %), then sevoflurane off',
    freshGasLpm: botmanFlow,
    schedule: [
      { atMin: 0, vaporPct: 8 },
      { atMin: 2.5, vaporPct: 3.5 },
      { atMin: 92.5, vaporPct: 0 },
    ],
    premedication: 'None stated in the abstract',
    endpoint: 'recoveryUnspecified',
    endpointDefinition:
      'Time to recovery (not defined in the text read), taken as timed from the vaporiser off',
    observedMin: 6.4,
    spread: { kind: 'SD or SE (not stated)', valueMin: 1.7 },
    n: 7,
    assumptions: [
      'Duration of the MAC bracketing is not in the abstract: 50 min assumed, plus the 40 min at 1 MAC, 90 min in all',
      'Dial for an end-tidal 3.0 % is not in the abstract: 3.5 % assumed',
      'Body mass and flow not given in the abstract',
    ],
  },
  {
    id: 'langlois-2003-amazon-iso-induction',
    split: 'judge',
    source: 'Langlois et al. 2003',
    citation: langloisCitation,
    readFrom:
      'Abstract: https://complete.bioone.org/journals/journal-of-avian-medicine-and-surgery/volume-17/issue-1/1082-6742_2003_017_0004_CAAEOI_2.0.CO_2/Cardiopulmonary-and-Anesthetic-Effects-of-Isoflurane-and-Propofol-in-Hispaniolan/10.1647/1082-6742(2003)017%5B0004:CAAEOI%5D2.0.CO;2.short',
    species: 'Hispaniolan Amazon parrot (Amazona ventralis), adult',
    bodyMassG: amazonMass,
    agent: 'isoflurane',
    route: 'mask',
    studyRoute:
      'Induced and maintained with isoflurane in oxygen for 30 min (route of induction not in the abstract)',
    freshGasLpm: { value: 1, basis: 'Assumption: fresh gas flow is not given in the abstract; 1 L/min' },
    schedule: [{ atMin: 0, vaporPct: 5 }],
    premedication: 'None stated in the abstract',
    endpoint: 'inductionUnspecified',
    endpointDefinition: 'Induction time (not defined in the text read)',
    observedMin: 58 / 60,
    spread: { kind: 'SD', valueMin: 15 / 60 },
    n: 10,
    assumptions: [
      'Dial and route not given in the abstract: mask at 5 % (the isoflurane vaporiser maximum, common practice for mask induction)',
      'Body mass and flow not given in the abstract',
      'No Hispaniolan Amazon row in the species reference: the agent default MAC is used',
    ],
  },
  {
    id: 'chemonges-2014-cockatoo-iso-first-reflex',
    split: 'judge',
    source: 'Chemonges 2014',
    citation: chemongesCitation,
    readFrom:
      'Abstract: https://www.uiindex.org/search/articledetails/23007549 (also https://d.docksci.com/effect-of-intermittent-positive-pressure-ventilation-on-depth-of-anaesthesia-dur_5afab1ced64ab21b2d840df0.html)',
    species: 'Sulphur-crested cockatoo (Cacatua galerita galerita), adult',
    macPct: {
      value: 1.44,
      basis: 'Curro, Brunson & Paul-Murphy 1994: cockatoo isoflurane ED50 1.44 ± 0.07 %',
    },
    bodyMassG: {
      value: 800,
      basis: 'Assumption (from memory): body mass is not given in the abstract; about 800 g',
    },
    agent: 'isoflurane',
    route: 'endotracheal',
    studyRoute:
      'Induction with 3.0 % isoflurane (mask with a T-piece in the companion 2012 study), maintained at 1.5 % or 3.0 %, spontaneous ventilation or IPPV',
    freshGasLpm: { value: 1, basis: 'Assumption: fresh gas flow is not given in the abstract; 1 L/min' },
    schedule: [
      { atMin: 0, vaporPct: 3 },
      { atMin: 5, vaporPct: 1.5 },
      { atMin: 65, vaporPct: 0 },
    ],
    premedication: 'None stated in the abstract',
    endpoint: 'firstMovement',
    endpointDefinition:
      'Appearance of the body jerk reflex during recovery (the first of the reflexes to return)',
    observedMin: 126 / 60,
    spread: { kind: 'SD or SE (not stated)', valueMin: 27 / 60 },
    n: 6,
    assumptions: [
      'The abstract does not say which runs the reflex times come from; read as pooled over the runs (1.5 % and 3.0 %, spontaneous and IPPV); the row runs the mildest one: spontaneous ventilation at 1.5 %',
      'Induction lasts 5 min and maintenance 60 min (the companion 2012 study monitored for one hour); neither is in the abstract',
      'Body mass and flow not given in the abstract',
    ],
  },
];

/**
 * Published observations kept out of the runs, with the reason. They are listed so that nobody
 * adds them by mistake and so the docs can name them.
 */
export const excludedObservations: readonly { readonly citation: string; readonly reason: string }[] = [
  {
    citation:
      'Al-Sobayil F.A. et al. (2009) The use of xylazine, ketamine, and isoflurane for induction and maintenance of anesthesia in ostriches (Struthio camelus). Journal of Avian Medicine and Surgery 23(2). Abstract read at http://www.biomedsearch.com/article/use-xylazine-ketamine-isoflurane-induction/252006949.html: recovery complete 50 ± 24 min (mean, SD) after isoflurane off, 7 ostriches of 100-130 kg',
    reason:
      'Premedicated (xylazine 4 mg/kg IM, ketamine 8 mg/kg IV) and far above the 15 kg the plan accepts: usable to test cautions only',
  },
];
