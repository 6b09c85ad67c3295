import { useMemo } from 'react';
import type { ProcedureEntryValues } from '../../contract/records.js';
import { TimeChart } from '../common/time-chart.js';
import { useChannel } from '../common/use-channel.js';
import { href } from '../shell/areas.js';
import { planBesideLog } from './plan-beside-log.js';

/** The linked plan's predicted curve and dial schedule beside the dial settings logged. */
export function PlanComparison({
  planId,
  startedAt,
  entries,
}: {
  readonly planId: number;
  readonly startedAt: string;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
}) {
  const [load] = useChannel('plans:get', { id: planId });
  const series = useMemo(() => {
    if (load.state !== 'ready') return null;
    const plan = load.value.plan;
    return planBesideLog(
      { input: plan.input, timeline: plan.result.timeline, macPct: plan.result.mac.valuePct },
      startedAt,
      entries,
    );
  }, [load, startedAt, entries]);
  if (load.state === 'failed')
    return (
      <p className="form-error">
        Plan {planId}: {load.error.message}
      </p>
    );
  if (series === null || load.state !== 'ready') return <p aria-busy="true">Loading plan {planId}…</p>;
  const result = load.value.plan.result;
  return (
    <section className="record-plan" aria-label={`Plan ${planId} beside the log`}>
      <h2>
        Plan {planId} beside the log · <a href={href('plans', planId)}>open the plan</a>
      </h2>
      <TimeChart
        x={series.minutes}
        xLabel="Minutes from start"
        series={[
          {
            label: 'Planned dial (%)',
            values: series.plannedDialPct,
            stroke: 'var(--chart-grey)',
            dash: [8, 4],
            width: 1.5,
            scale: 'dial',
          },
          {
            label: 'Logged dial (%)',
            values: series.loggedDialPct,
            stroke: 'var(--chart-amber)',
            width: 2,
            points: true,
            scale: 'dial',
          },
          {
            label: 'Predicted brain (× MAC)',
            values: series.predictedBrainMac,
            stroke: 'var(--chart-blue)',
            width: 2.5,
            scale: 'mac',
          },
        ]}
        axes={[
          { scale: 'dial', label: 'Vaporiser dial (%)' },
          { scale: 'mac', label: 'Brain (× MAC)', side: 'right' },
        ]}
        height={260}
        summary={`Plan ${planId}: planned and logged vaporiser settings, and the predicted brain level as a multiple of MAC (${result.mac.valuePct} %).`}
      />
      <p className="basis">
        Predicted for the plan's schedule, not for what was given: if the logged dial differs from the plan,
        the bird's level differs too. MAC {result.mac.valuePct} % ({result.mac.basis}).
      </p>
    </section>
  );
}
