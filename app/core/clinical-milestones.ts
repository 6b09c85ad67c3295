/**
 * The four clinical milestones as the clinic reads them (plan command summary, planning screen,
 * worksheet): name, predicted minutes, 5-95 % range, the "not reached by N % of birds like this"
 * note and a short definition in the clinic's words. Pure: one source for every place that shows
 * predicted times, so the screen, the paper and the terminal say the same thing.
 */
import { formatQuantity } from './units.js';

type MilestoneId = 'lossOfRighting' | 'surgicalDepth' | 'firstMovement' | 'standing';

/** The part of a plan result these lines read (the core result and a read-back snapshot both fit). */
export type MilestoneSource = {
  readonly milestones: {
    readonly lossOfRightingMin: number | null;
    readonly surgicalDepthMin: number | null;
    readonly firstMovementMin: number | null;
    readonly standingMin: number | null;
    readonly vaporiserOffMin: number | null;
    readonly definitions: readonly {
      readonly id: MilestoneId;
      readonly label: string;
      readonly macMultiple: number;
      readonly when: 'rising' | 'falling';
      readonly basis: string;
    }[];
  };
  readonly uncertainty: {
    readonly samples: number;
    readonly milestones: readonly {
      readonly id: MilestoneId;
      readonly percentiles: { readonly p5: number; readonly p95: number } | null;
      readonly note: string | null;
    }[];
  };
};

export type ClinicalMilestoneLine = {
  readonly id: MilestoneId;
  /** e.g. "Loss of righting". */
  readonly label: string;
  /** 'start' counts from the start of the plan, 'vaporiser off' from the moment it is turned off. */
  readonly from: 'start' | 'vaporiser off';
  /** Predicted minutes, or null when not reached or not computed. */
  readonly minutes: number | null;
  /** e.g. "3.4 min", "not reached in the planned time". */
  readonly minutesText: string;
  /** e.g. "2.9-4.1 min", or null without an uncertainty run. */
  readonly rangeText: string | null;
  /** "not reached by N % of birds like this", or null when every sampled bird reached it. */
  readonly note: string | null;
  /** Short definition, e.g. "Standing or perching: brain below 0.2 x MAC (assumption)". */
  readonly definition: string;
};

const order: readonly MilestoneId[] = ['lossOfRighting', 'surgicalDepth', 'firstMovement', 'standing'];

const fallbackLabels: Readonly<Record<MilestoneId, string>> = {
  lossOfRighting: 'Loss of righting',
  surgicalDepth: 'Planned surgical depth',
  firstMovement: 'First movement or head lift',
  standing: 'Standing or perching',
};

function minutesOf(source: MilestoneSource, id: MilestoneId): number | null {
  const m = source.milestones;
  if (id === 'lossOfRighting') return m.lossOfRightingMin;
  if (id === 'surgicalDepth') return m.surgicalDepthMin;
  if (id === 'firstMovement') return m.firstMovementMin;
  return m.standingMin;
}

/** Where the threshold comes from, in a few words. */
function basisWord(id: MilestoneId, basis: string): string {
  if (basis === 'entered for this plan') return 'entered for this plan';
  if (id === 'surgicalDepth') return "the plan's depth";
  if (/^assumption/i.test(basis)) return 'assumption';
  if (/^common practice/i.test(basis)) return 'common practice';
  return 'see the model notes';
}

function figureText(value: number, unit: string): string {
  return formatQuantity(value, unit, 2).text;
}

/**
 * The four clinical milestones of a computed plan, in clinical order (loss of righting, planned
 * surgical depth, first movement or head lift, standing or perching).
 * A plan saved before the model stated these milestones (no definitions) gives each line
 * "not computed by the model this plan was saved with" rather than a false "not reached".
 * @param source the plan result (or its read-back snapshot)
 * @returns four lines; minutes >= 0 or null; range text only when the uncertainty run has samples
 */
export function clinicalMilestoneLines(source: MilestoneSource): ClinicalMilestoneLine[] {
  return order.map((id) => {
    const definition = source.milestones.definitions.find((entry) => entry.id === id);
    const from = id === 'lossOfRighting' || id === 'surgicalDepth' ? 'start' : 'vaporiser off';
    if (definition === undefined) {
      return {
        id,
        label: fallbackLabels[id],
        from,
        minutes: null,
        minutesText: 'not computed by the model this plan was saved with',
        rangeText: null,
        note: null,
        definition: `${fallbackLabels[id]}: not defined by the model this plan was saved with; compute the plan again`,
      };
    }
    const band = source.uncertainty.milestones.find((entry) => entry.id === id);
    const minutes = minutesOf(source, id);
    const offNotSet = from === 'vaporiser off' && source.milestones.vaporiserOffMin === null;
    const level =
      definition.when === 'rising'
        ? `brain reaches ${String(definition.macMultiple)} x MAC`
        : `brain below ${String(definition.macMultiple)} x MAC after the vaporiser is off`;
    return {
      id,
      label: definition.label,
      from,
      minutes,
      minutesText:
        minutes !== null
          ? figureText(minutes, 'min')
          : offNotSet
            ? 'vaporiser never turned off'
            : 'not reached in the planned time',
      rangeText:
        source.uncertainty.samples > 0 && band?.percentiles != null
          ? `${String(formatQuantity(band.percentiles.p5, '', 2).value)}-${figureText(band.percentiles.p95, 'min')}`
          : null,
      note: band?.note ?? null,
      definition: `${definition.label}: ${level} (${basisWord(id, definition.basis)})`,
    };
  });
}
