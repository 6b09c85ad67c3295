import { useEffect, useMemo, useRef, useState } from 'react';
import { recordLogOf } from '../../contract/evidence-channels.js';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import { speciesToReference } from '../../contract/species-mapping.js';
import { forecastPlan, readForecast, type LogForecast } from '../../core/evidence/forecast.js';
import type { LogPlan } from '../../core/evidence/record-log.js';
import { computePlanCourse, planUncertaintyInput } from '../../core/model/compute-plan.js';
import { mergeUncertainty } from '../../core/model/uncertainty.js';
import { BandPool, poolSize, type SliceWorker } from '../plans/band-pool.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { forecastReadout } from './forecast-text.js';
import { RecordOutcome } from './record-outcome.js';
import './evidence.css';

/** Uncertainty samples of the band run in the workers (the quick answer has none). */
const bandSamples = 40;

function newBandWorker(): SliceWorker {
  // Written out here so that Vite finds and bundles the worker.
  return new Worker(new URL('../plans/plan-worker.ts', import.meta.url), {
    type: 'module',
  }) as unknown as SliceWorker;
}

/**
 * The forecast that follows the log: the model run on what has been logged, with the vaporiser
 * off now. Recomputed at every saved row and once a minute; after the record ends, the observed
 * milestones beside the prediction for what was given.
 */
export function LogForecastPanel({
  detail,
  nowMs,
}: {
  readonly detail: ProcedureDetail;
  readonly nowMs: number;
}) {
  if (detail.record.values.endedAt !== null) return <RecordOutcome recordId={detail.record.id} />;
  return <RunningForecast detail={detail} nowMs={nowMs} />;
}

function RunningForecast({ detail, nowMs }: { readonly detail: ProcedureDetail; readonly nowMs: number }) {
  const settings = useClinicSettings();
  const planId = detail.record.values.planId;
  const [planLoad] = useChannel('plans:get', { id: planId ?? 1 });
  const [speciesLoad] = useChannel('species:list', {});
  const minuteMs = Math.floor(nowMs / 60_000) * 60_000;
  const species = useMemo(
    () => (speciesLoad.state === 'ready' ? speciesLoad.value.map(speciesToReference) : null),
    [speciesLoad],
  );
  const plan = planId === null ? null : planLoad.state === 'ready' ? planLoad.value.plan.input : undefined;
  const built = useMemo((): { plan: Extract<LogPlan, { ok: true }> } | { missing: string } | null => {
    if (plan === undefined || species === null) return null;
    const logged = recordLogOf(detail.record, detail.entries, {
      bodyMassG: detail.latestMassG,
      speciesKey: detail.patient.values.speciesKey,
      plan,
      defaultAgent: settings.defaultAgent,
    });
    if (!logged.ok) return { missing: logged.missing };
    const forecast = forecastPlan(logged.log, minuteMs);
    return forecast.ok ? { plan: forecast } : { missing: forecast.missing };
  }, [detail, plan, species, settings.defaultAgent, minuteMs]);

  // The quick answer, during the render: a few milliseconds for a 3-h record.
  const quick = useMemo((): LogForecast | { failure: string } | null => {
    if (built === null || !('plan' in built) || species === null) return null;
    try {
      return readForecast(built.plan, computePlanCourse(built.plan.input, { species }), minuteMs);
    } catch (error) {
      return { failure: error instanceof Error ? error.message : String(error) };
    }
  }, [built, species, minuteMs]);

  // The band: the same run with uncertainty samples, in slices over the planning screen's pool of
  // workers (plan-worker.ts), merged into the course when they are all in.
  const pool = useRef<BandPool | null>(null);
  const [banded, setBanded] = useState<{ key: string; forecast: LogForecast } | null>(null);
  const bandKey = built !== null && 'plan' in built ? JSON.stringify(built.plan.input) : '';
  useEffect(
    () => () => {
      pool.current?.close();
      pool.current = null;
    },
    [],
  );
  useEffect(() => {
    if (built === null || !('plan' in built) || species === null) return undefined;
    const request = { ...built.plan.input, uncertainty: { samples: bandSamples, seed: 1 } };
    pool.current ??= new BandPool(poolSize(navigator.hardwareConcurrency), newBandWorker);
    pool.current.run(request, species, {
      onProgress: () => undefined,
      onDone: (slices) => {
        try {
          const sampled = mergeUncertainty(planUncertaintyInput(request, { species }), slices);
          const course = computePlanCourse(request, { species }, { sampled });
          setBanded({ key: bandKey, forecast: readForecast(built.plan, course, minuteMs) });
        } catch {
          // The quick answer stays on view without its band.
        }
      },
      onFailure: () => undefined,
    });
    return () => pool.current?.cancel();
  }, [built, bandKey, species, minuteMs]);

  const shown =
    banded !== null && banded.key === bandKey
      ? banded.forecast
      : quick !== null && !('failure' in quick)
        ? quick
        : null;
  const readout = shown === null ? null : forecastReadout(shown);
  return (
    <section className="evidence-forecast" aria-labelledby="forecast-title" aria-live="polite">
      <h2 id="forecast-title">Forecast that follows the log</h2>
      {built !== null && 'missing' in built && <p>No forecast yet: {built.missing}.</p>}
      {quick !== null && 'failure' in quick && (
        <p className="form-error">The model could not run on this log: {quick.failure}</p>
      )}
      {shown !== null && (
        <>
          <dl>
            <div>
              <dt>Predicted depth now</dt>
              <dd data-testid="forecast-depth">{readout?.depth}</dd>
            </div>
            <div>
              <dt>{readout?.offLabel}</dt>
              <dd>{readout?.off}</dd>
            </div>
            <div>
              <dt>First movement about</dt>
              <dd data-testid="forecast-first-movement">{readout?.firstMovement}</dd>
            </div>
            <div>
              <dt>Standing or perching about</dt>
              <dd data-testid="forecast-standing" data-minutes-after-off={readout?.standingMinutesAfterOff}>
                {readout?.standing}
              </dd>
            </div>
          </dl>
          <p className="basis">
            An estimate for a typical bird given this log (MAC {shown.macPct} %), not a measurement: the bird
            decides. Watch the bird, not the forecast. {shown.notes.join(' ')}
            {banded === null || banded.key !== bandKey ? ' Band being computed…' : ''}
          </p>
        </>
      )}
    </section>
  );
}
