import type { EvidenceRow } from '../../contract/evidence-channels.js';
import type { EvidenceMilestoneId } from '../../core/evidence/observed.js';
import { evidenceBandFactor, evidenceChartData, evidenceChartSize } from './evidence-chart-data.js';

const { width, height, margin } = evidenceChartSize;

/**
 * Predicted (x) against observed (y) minutes of one milestone on log axes, with the identity
 * line and the x1.5 band; one point per record that has both.
 */
export function EvidenceChart({
  rows,
  milestone,
  label,
}: {
  readonly rows: readonly EvidenceRow[];
  readonly milestone: EvidenceMilestoneId;
  readonly label: string;
}) {
  const { points, within, ticks, x: sx, y: sy, line, band } = evidenceChartData(rows, milestone);
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  return (
    <figure className="evidence-chart">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        role="img"
        aria-label={`${label}: observed against predicted minutes for ${points.length} records, ${within} within x1.5 of the prediction.`}
      >
        <defs>
          <clipPath id="evidence-plot">
            <rect x={margin.left} y={margin.top} width={plotWidth} height={plotHeight} />
          </clipPath>
        </defs>
        <rect
          x={margin.left}
          y={margin.top}
          width={plotWidth}
          height={plotHeight}
          fill="none"
          stroke="var(--chart-axis)"
        />
        {ticks.map((tick) => (
          <g key={tick}>
            <line
              x1={sx(tick)}
              x2={sx(tick)}
              y1={margin.top}
              y2={margin.top + plotHeight}
              stroke="var(--chart-grid)"
            />
            <line
              x1={margin.left}
              x2={margin.left + plotWidth}
              y1={sy(tick)}
              y2={sy(tick)}
              stroke="var(--chart-grid)"
            />
            <text
              x={sx(tick)}
              y={margin.top + plotHeight + 16}
              textAnchor="middle"
              fill="var(--chart-ink)"
              fontSize="11"
            >
              {tick}
            </text>
            <text x={margin.left - 6} y={sy(tick) + 4} textAnchor="end" fill="var(--chart-ink)" fontSize="11">
              {tick}
            </text>
          </g>
        ))}
        <g clipPath="url(#evidence-plot)">
          <path d={band} fill="var(--chart-band-fill)" stroke="none" />
          <path
            d={line(evidenceBandFactor)}
            stroke="var(--chart-band-line)"
            strokeDasharray="4 3"
            fill="none"
          />
          <path
            d={line(1 / evidenceBandFactor)}
            stroke="var(--chart-band-line)"
            strokeDasharray="4 3"
            fill="none"
          />
          <path d={line(1)} stroke="var(--chart-grey)" strokeWidth="1.5" fill="none" />
          {points.map((point) => (
            <circle
              key={point.id}
              cx={sx(point.x)}
              cy={sy(point.y)}
              r={point.excluded ? 3 : 3.5}
              fill={point.excluded ? 'none' : 'var(--chart-blue)'}
              stroke={point.excluded ? 'var(--chart-grey)' : 'var(--chart-blue)'}
              fillOpacity={0.75}
            />
          ))}
        </g>
        <text
          x={margin.left + plotWidth / 2}
          y={height - 8}
          textAnchor="middle"
          fill="var(--chart-ink)"
          fontSize="12"
        >
          Predicted for what was given (min, log scale)
        </text>
        <text
          transform={`translate(14 ${margin.top + plotHeight / 2}) rotate(-90)`}
          textAnchor="middle"
          fill="var(--chart-ink)"
          fontSize="12"
        >
          Observed (min, log scale)
        </text>
      </svg>
      <figcaption>
        {label}: {points.length} records; {within} within x1.5 of the prediction (shaded band; the line is
        observed = predicted). Hollow points are left out of the calibration.
      </figcaption>
    </figure>
  );
}
