import { memo, useState } from 'react';
import type { PlanResult } from '../../core/model/plan-types.js';
import { plainBasis } from '../common/display.js';
import { figure } from './format.js';

const rows: readonly { key: keyof PlanResult['estimates']; label: string; unit: string }[] = [
  { key: 'tidalVolumeMl', label: 'Tidal volume', unit: 'mL' },
  { key: 'breathsPerMin', label: 'Breathing rate', unit: '/min' },
  { key: 'minuteVentilationMlMin', label: 'Minute ventilation', unit: 'mL/min' },
  { key: 'trachealDeadSpaceMl', label: 'Tracheal dead space', unit: 'mL' },
  { key: 'lungVolumeMl', label: 'Lung (parabronchial) volume', unit: 'mL' },
  { key: 'posteriorSacsMl', label: 'Posterior (caudal) air sacs', unit: 'mL' },
  { key: 'anteriorSacsMl', label: 'Anterior (cranial) air sacs', unit: 'mL' },
  { key: 'airSacVolumeMl', label: 'Air-sac reservoir (non-exchanging)', unit: 'mL' },
  { key: 'heartRatePerMin', label: 'Heart rate', unit: '/min' },
  { key: 'cardiacOutputMlMin', label: 'Cardiac output', unit: 'mL/min' },
];

/** The bird's estimates; each shows its basis on hover, and on tap or Enter for keyboards. */
export const EstimateList = memo(
  function EstimateList({ estimates }: { readonly estimates: PlanResult['estimates'] }) {
    const [open, setOpen] = useState<string | null>(null);
    return (
      <dl className="estimates">
        {rows.map((row) => {
          const estimate = estimates[row.key];
          const shown = open === row.key;
          return (
            <div key={row.key} className="estimate">
              <dt>{row.label}</dt>
              <dd>
                <button
                  type="button"
                  className="estimate-value"
                  title={plainBasis(estimate.basis)}
                  aria-expanded={shown}
                  onClick={() => setOpen(shown ? null : row.key)}
                >
                  {figure(estimate.value)} {row.unit}
                  {estimate.basis === 'measured' && <span className="tag">measured</span>}
                  {/^assumption/i.test(estimate.basis) && <span className="tag">assumption</span>}
                </button>
                {shown && <span className="basis">Basis: {plainBasis(estimate.basis)}</span>}
              </dd>
            </div>
          );
        })}
      </dl>
    );
  },
  (previous, next) => JSON.stringify(previous.estimates) === JSON.stringify(next.estimates),
);
