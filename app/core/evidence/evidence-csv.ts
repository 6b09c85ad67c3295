/**
 * The observed-vs-predicted list as CSV (RFC 4180): one row per completed record, the observed
 * and predicted minutes and the ratio of each milestone, and why a milestone or the record was
 * skipped. Minutes of induction and intubation are from the first dial above 0; of first
 * movement, standing and extubation from the vaporiser off.
 */
import { csvCell } from '../procedure-csv.js';
import { evidenceMilestoneIds, milestoneEvents, type EvidenceMilestoneId } from './observed.js';

export type EvidenceCsvRow = {
  readonly recordId: number;
  readonly patientName: string;
  readonly speciesName: string;
  readonly agent: string;
  readonly airway: string;
  readonly staffInitials: string;
  readonly procedureName: string;
  readonly startedAt: string;
  readonly endedAt: string;
  readonly bodyMassG: number | null;
  readonly skipped: string | null;
  readonly excludedReason: string | null;
  readonly extubationMin: number | null;
  readonly milestones: readonly {
    readonly id: EvidenceMilestoneId;
    readonly observedMin: number | null;
    readonly predictedMin: number | null;
    readonly ratio: number | null;
    readonly skipped: string | null;
  }[];
};

export const evidenceCsvHeaders: readonly string[] = [
  'record',
  'patient',
  'species',
  'agent',
  'airway',
  'staff',
  'procedure',
  'started (UTC)',
  'ended (UTC)',
  'body mass (g)',
  ...evidenceMilestoneIds.flatMap((id) => [
    `${milestoneEvents[id].label} observed (min)`,
    `${milestoneEvents[id].label} predicted (min)`,
    `${milestoneEvents[id].label} observed / predicted`,
    `${milestoneEvents[id].label} skipped because`,
  ]),
  'extubation after vaporiser off (min)',
  'record skipped because',
  'left out of the calibration because',
];

const round = (value: number | null, digits: number) =>
  value === null ? null : Math.round(value * 10 ** digits) / 10 ** digits;

/**
 * CSV text, header first, one line per row.
 * @param rows the records in the order shown
 */
export function evidenceCsv(rows: readonly EvidenceCsvRow[]): string {
  const lines = [evidenceCsvHeaders.map(csvCell).join(',')];
  for (const row of rows) {
    const cells: (string | number | null)[] = [
      row.recordId,
      row.patientName,
      row.speciesName,
      row.agent,
      row.airway,
      row.staffInitials,
      row.procedureName,
      row.startedAt,
      row.endedAt,
      row.bodyMassG,
    ];
    for (const id of evidenceMilestoneIds) {
      const milestone = row.milestones.find((entry) => entry.id === id);
      cells.push(
        round(milestone?.observedMin ?? null, 2),
        round(milestone?.predictedMin ?? null, 2),
        round(milestone?.ratio ?? null, 3),
        milestone?.skipped ?? (row.skipped === null ? null : 'record skipped'),
      );
    }
    cells.push(row.extubationMin, row.skipped, row.excludedReason);
    lines.push(cells.map(csvCell).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}
