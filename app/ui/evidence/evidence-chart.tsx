import type { EvidenceRow } from '../../contract/evidence-channels.js';
import type { EvidenceMilestoneId } from '../../core/evidence/observed.js';

const width = 420;
const height = 360;
const margin = { left: 56, right: 16, top: 16, bottom: 48 };

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
  const points = rows.flatMap((row) => {
    const entry = row.milestones.find((candidate) => candidate.id === milestone);
    return entry?.observedMin != null && entry.predictedMin != null
      ? [{ x: entry.predictedMin, y: entry.observedMin, excluded: row.exclusion !== null, id: row.recordId }]
      : [];
  });
  const values = points.flatMap((point) => [point.x, point.y]);
  const low = values.length === 0 ? 0.5 : Math.max(0.05, Math.min(...values) / 1.6);
  const high = values.length === 0 ? 60 : Math.max(...values) * 1.6;
  const logLow = Math.log10(low);
  const logHigh = Math.log10(high);
  const plotWidth = width - margin.left - margin.right;
  const plotHeight = height - margin.top - margin.bottom;
  const sx = (value: number) => margin.left + ((Math.log10(value) - logLow) / (logHigh - logLow)) * plotWidth;
  const sy = (value: number) =>
    margin.top + plotHeight - ((Math.log10(value) - logLow) / (logHigh - logLow)) * plotHeight;
  const ticks = [0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100, 200].filter((tick) => tick >= low && tick <= high);
  const within = points.filter((point) => point.y / point.x <= 1.5 && point.y / point.x >= 1 / 1.5).length;
  const line = (factor: number) => `M${sx(low)},${sy(low * factor)} L${sx(high)},${sy(high * factor)}`;
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
          <path
            d={`${line(1.5)} L${sx(high)},${sy(high / 1.5)} L${sx(low)},${sy(low / 1.5)} Z`}
            fill="var(--chart-band-fill)"
            stroke="none"
          />
          <path d={line(1.5)} stroke="var(--chart-band-line)" strokeDasharray="4 3" fill="none" />
          <path d={line(1 / 1.5)} stroke="var(--chart-band-line)" strokeDasharray="4 3" fill="none" />
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
