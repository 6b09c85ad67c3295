import { memo, useRef, useState, type ReactNode, type RefObject } from 'react';
import type { PlanResult } from '../../core/model/plan-types.js';
import { clinicalMilestoneLines, type ClinicalMilestoneLine } from '../../core/clinical-milestones.js';
import { plainBasis } from '../common/display.js';
import { EstimateList } from './estimate-list.js';
import { figure, minutes, wasteGasSourceLabel } from './format.js';
import { PlanChart } from './plan-chart.js';
import { PhaseList } from './phase-list.js';
import type { BandProgress } from './band-pool.js';
import { useCovers } from './sticky-clear.js';

type Props = {
  readonly result: PlanResult;
  readonly setFreshGasLpm: number | null;
  readonly pending: boolean;
  /** Parts of the band's samples done while it computes (the pool's progress), else null. */
  readonly band?: BandProgress | null;
  readonly compareWith?: { readonly label: string; readonly result: PlanResult } | undefined;
};

/**
 * Re-renders a section only when the part of the result it shows has changed, so that a
 * keystroke redraws the curves without rebuilding every panel.
 */
function sameContent(previous: unknown, next: unknown): boolean {
  return JSON.stringify(previous) === JSON.stringify(next);
}

const Section = memo(
  function Section({ children }: { readonly children: ReactNode; readonly content: unknown }) {
    return <>{children}</>;
  },
  (previous, next) => sameContent(previous.content, next.content),
);

/** Test ids of the milestone figures; planned depth and first movement keep their earlier ids. */
const milestoneTestIds: Readonly<Record<ClinicalMilestoneLine['id'], string>> = {
  lossOfRighting: 'loss-of-righting-time',
  surgicalDepth: 'induction-time',
  firstMovement: 'recovery-time',
  standing: 'standing-time',
};

/** Cautions, ordered danger first; always the first thing in the results. */
export function CautionList({
  cautions,
  label = 'Cautions',
}: {
  readonly cautions: PlanResult['cautions'];
  readonly label?: string;
}) {
  if (cautions.length === 0) {
    return <p className="muted">No cautions for this plan. The bird and the veterinarian still decide.</p>;
  }
  return (
    <ul className="cautions" aria-label={label}>
      {cautions.map((caution) => (
        <li key={caution.code} className={`flag ${caution.severity}`}>
          <strong>{caution.severity}</strong>
          {caution.message}
          <span className="basis">Why: {caution.reason}</span>
        </li>
      ))}
    </ul>
  );
}

const severityRank: Readonly<Record<PlanResult['cautions'][number]['severity'], number>> = {
  danger: 0,
  warning: 1,
  notice: 2,
};

/**
 * The sticky cautions panel: the count and the most severe caution always in view, the rest behind
 * one button, so that the predicted times below stay above the fold at 1366x800. Folded by
 * default; the button says how many more there are and carries aria-expanded. While it would
 * cover part of `clearOf` (the depth chart) it is not held at the top, so the chart shows whole.
 */
export function CautionsPanel({
  cautions,
  clearOf,
}: {
  readonly cautions: PlanResult['cautions'];
  readonly clearOf?: RefObject<HTMLElement | null>;
}) {
  const [expanded, setExpanded] = useState(false);
  const panel = useRef<HTMLElement>(null);
  const nothing = useRef<HTMLElement>(null);
  const letGo = useCovers(panel, clearOf ?? nothing);
  // Danger first, then warnings, then notices; the model's own order within each.
  const [first, ...rest] = [...cautions].sort(
    (one, other) => severityRank[one.severity] - severityRank[other.severity],
  );
  const worst = cautions.filter((caution) => caution.severity === first?.severity).length;
  return (
    <section
      ref={panel}
      className={letGo ? 'panel cautions-panel cautions-let-go' : 'panel cautions-panel'}
      aria-labelledby="cautions-heading"
    >
      <div className="cautions-head">
        <h2 id="cautions-heading">
          Cautions ({cautions.length})
          {first !== undefined && (
            <span className="cautions-count">
              {' '}
              · {worst} {first.severity}
              {worst === 1 ? '' : 's'}
            </span>
          )}
        </h2>
        {rest.length > 0 && (
          <button
            type="button"
            className="cautions-toggle"
            aria-expanded={expanded}
            aria-controls="cautions-more"
            onClick={() => setExpanded((open) => !open)}
          >
            {expanded ? 'Show only the first' : `Show ${rest.length} more`}
          </button>
        )}
      </div>
      <CautionList cautions={first === undefined ? [] : [first]} label="Most severe caution" />
      {rest.length > 0 && (
        <div id="cautions-more" className="cautions-more" hidden={!expanded}>
          <CautionList cautions={rest} label="More cautions" />
        </div>
      )}
    </section>
  );
}

/** Everything the model says about one plan, each figure with its unit and basis. */
export function PlanResults({ result, setFreshGasLpm, pending, band = null, compareWith }: Props) {
  const milestones = result.milestones;
  const uncertainty = result.uncertainty;
  const flows = result.flows;
  const waste = result.wasteGas;
  const chart = useRef<HTMLDivElement>(null);
  return (
    <div className="plan-results" aria-busy={pending}>
      <CautionsPanel cautions={result.cautions} clearOf={chart} />

      <section className="panel" aria-labelledby="milestones-heading">
        <h2 id="milestones-heading">
          Predicted times{' '}
          {pending && (
            <span className="computing">
              {band === null
                ? 'updating…'
                : `band: computing…${band.total > 1 ? ` ${String(band.done)} of ${String(band.total)} parts` : ''}`}
            </span>
          )}
        </h2>
        <dl className="milestones">
          {clinicalMilestoneLines(result).map((line) => (
            <div key={line.id}>
              {/* The definition shows on hover (title) and on tap (the disclosure below). */}
              <dt title={line.definition}>
                {line.label}
                {line.from === 'vaporiser off' ? ' (after vaporiser off)' : ''}
              </dt>
              <dd data-testid={milestoneTestIds[line.id]}>
                {minutes(line.minutes, line.minutesText)}
                <span className="basis">
                  5th-95th percentile:{' '}
                  {uncertainty.samples === 0 ? 'computing…' : (line.rangeText ?? 'range not available')}
                  {line.note === null ? '' : ` · ${line.note}`}
                </span>
                <details className="milestone-definition">
                  <summary>What this milestone means</summary>
                  {line.definition}
                </details>
              </dd>
            </div>
          ))}
          <div>
            <dt>Air sacs at 95 % of inspired</dt>
            <dd>
              {milestones.airSacWashin95Breaths === null
                ? 'not reached'
                : `${figure(milestones.airSacWashin95Breaths, 2)} breaths, ${minutes(milestones.airSacWashin95Min)}`}
            </dd>
          </div>
          <div>
            <dt>Air sacs washed out to 5 %</dt>
            <dd>
              {milestones.airSacWashout95Breaths === null
                ? 'not reached'
                : `${figure(milestones.airSacWashout95Breaths, 2)} breaths, ${minutes(milestones.airSacWashout95Min)}`}
            </dd>
          </div>
          <div>
            <dt>Deepest predicted brain level</dt>
            <dd>{figure(milestones.peakBrainMacMultiple, 2)} × MAC</dd>
          </div>
        </dl>
        <p className="basis">
          MAC used: {figure(result.mac.valuePct)} % ({plainBasis(result.mac.basis)}). Arousal threshold:{' '}
          {result.recoveryMacFraction.basis}. {milestones.basis}
        </p>
        <div ref={chart}>
          <PlanChart result={result} compareWith={compareWith} />
        </div>
        <p className="basis">
          Range from {uncertainty.samples} samples: {uncertainty.method}
        </p>
      </section>

      {result.phases.length > 0 && (
        <section className="panel" aria-labelledby="phases-heading">
          <h2 id="phases-heading">
            {result.phases.length === 1 ? 'Route, flow and dial' : `Phases (${result.phases.length})`}
          </h2>
          <PhaseList phases={result.phases} agent={result.agent} />
        </section>
      )}

      <Section content={[result.flows, result.consumption, result.oxygen, result.agent, setFreshGasLpm]}>
        <section className="panel" aria-labelledby="flows-heading">
          <h2 id="flows-heading">Fresh gas, agent and oxygen</h2>
          <dl className="details">
            <dt>Recommended fresh gas{result.phases.length > 1 ? ', phase 1' : ''}</dt>
            <dd>
              {figure(flows.recommendedLpm)} L/min (rebreathing below {figure(flows.minimumLpm)} L/min)
              {setFreshGasLpm !== null && (
                <>
                  {' '}
                  · set:{' '}
                  <strong className={setFreshGasLpm < flows.minimumLpm ? 'too-low' : undefined}>
                    {figure(setFreshGasLpm)} L/min
                  </strong>
                </>
              )}
              <span className="basis">
                {flows.rule}. {flows.basis}
              </span>
              {flows.rebreathing && <span className="basis too-low">{flows.rebreathingReason}</span>}
            </dd>
            {flows.chamberTimeTo95Min !== null && (
              <>
                <dt>Chamber at 95 % of the dial</dt>
                <dd>
                  {minutes(flows.chamberTimeTo95Min)}
                  <span className="basis">
                    3 time constants of the chamber volume at the fresh gas flow (OpenAnesthesia)
                  </span>
                </dd>
              </>
            )}
            <dt>Liquid {result.agent}</dt>
            <dd>
              {figure(result.consumption.liquidMl)} mL for the plan ·{' '}
              {figure(result.consumption.liquidMlPerHour)} mL/h at{' '}
              {figure(result.consumption.maintenanceVaporPct)} %
              <span className="basis">
                {figure(result.consumption.vapourMlPerLiquidMl)} mL vapour per mL liquid at 20 °C.{' '}
                {result.consumption.basis}
              </span>
            </dd>
            <dt>Oxygen</dt>
            <dd>
              {figure(result.oxygen.usedL)} L over {figure(result.oxygen.durationMin)} min
              {result.oxygen.cylinderContentL !== null &&
                ` · cylinder ${figure(result.oxygen.cylinderContentL)} L, lasts ${minutes(result.oxygen.enduranceMin, 'no flow')} at the set flow`}
              {result.oxygen.suffices === false && (
                <strong className="too-low"> · not enough for the plan</strong>
              )}
              <span className="basis">{result.oxygen.basis}</span>
            </dd>
          </dl>
        </section>
      </Section>

      <Section content={waste}>
        <section className="panel" aria-labelledby="waste-heading">
          <h2 id="waste-heading">Waste gas in the room</h2>
          <p>
            Peak{' '}
            <strong className={waste.exceedsCeiling ? 'too-low' : undefined}>
              {figure(waste.peakPpm)} ppm
            </strong>{' '}
            against the {waste.ceilingPpm} ppm ceiling (NIOSH 1977) · highest 1-h mean{' '}
            {figure(waste.highestHourMeanPpm)} ppm · {figure(waste.releasedVapourMl)} mL vapour released ·{' '}
            {waste.scavenging ? 'scavenged' : 'not scavenged'} · room {figure(waste.roomVolumeM3)} m³,{' '}
            {figure(waste.airChangesPerHour)} air changes/h
          </p>
          <ul className="compact">
            {waste.sources.map((source) => (
              <li key={source.source}>
                {wasteGasSourceLabel(source.source)}: {figure(source.vapourMl)} mL of vapour
                <span className="basis">{source.basis}</span>
              </li>
            ))}
          </ul>
          <p className="basis">{waste.basis}</p>
        </section>
      </Section>

      <section className="panel" aria-labelledby="estimates-heading">
        <h2 id="estimates-heading">Estimates for this bird</h2>
        <p className="hint">Hover over a value, or select it, to see its basis.</p>
        <EstimateList estimates={result.estimates} />
      </section>

      <Section content={result.assumptions}>
        <section className="panel" aria-labelledby="assumptions-heading">
          <h2 id="assumptions-heading">Assumptions</h2>
          <ul className="compact basis-list">
            {result.assumptions.map((assumption) => (
              <li key={assumption}>{plainBasis(assumption)}</li>
            ))}
          </ul>
        </section>
      </Section>
    </div>
  );
}
