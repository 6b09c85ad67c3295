import { milestoneEvents } from '../../core/evidence/observed.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import { outcomeMilestoneText } from './evidence-text.js';

/** After a record ends: each observed milestone beside what the model predicted for what was given. */
export function RecordOutcome({ recordId }: { readonly recordId: number }) {
  const [load, reload] = useChannel('evidence:list', { recordId });
  useChangeNotices((notice) => notice.kind === 'evidence', reload);
  if (load.state === 'loading') return <p aria-busy="true">Comparing with the model…</p>;
  if (load.state === 'failed')
    return (
      <p className="form-error" role="alert">
        {load.error.message}
      </p>
    );
  const row = load.value.rows[0];
  if (row === undefined)
    return load.value.counts.pending > 0 ? (
      <p role="status">Still being compared with the model; shown here when ready.</p>
    ) : null;
  return (
    <section className="evidence-forecast" aria-labelledby="outcome-title">
      <h2 id="outcome-title">Observed beside predicted for what was given</h2>
      {row.skipped !== null ? (
        <p>Not compared: {row.skipped}.</p>
      ) : (
        <dl>
          {row.milestones.map((milestone) => (
            <div key={milestone.id}>
              <dt>{milestoneEvents[milestone.id].label}</dt>
              <dd>{outcomeMilestoneText(milestone)}</dd>
            </div>
          ))}
        </dl>
      )}
      <p className="basis">
        Induction and intubation from the first dial above 0; first movement and standing from the vaporiser
        off. {row.notes.join(' ')} <a href={href('evidence')}>All records, observed vs predicted</a>
      </p>
    </section>
  );
}
