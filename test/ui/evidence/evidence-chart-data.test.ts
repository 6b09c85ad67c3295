import { describe, expect, it } from 'vitest';
import type { EvidenceRow } from '../../../app/contract/evidence-channels.js';
import {
  evidenceBandFactor,
  evidenceChartData,
  evidenceChartSize,
} from '../../../app/ui/evidence/evidence-chart-data.js';

/** An invented completed record with one standing time observed and predicted (demo values). */
function row(
  recordId: number,
  standing: { observedMin: number | null; predictedMin: number | null },
  excluded = false,
): EvidenceRow {
  const ratio =
    standing.observedMin !== null && standing.predictedMin !== null
      ? standing.observedMin / standing.predictedMin
      : null;
  return {
    recordId,
    patientId: recordId,
    patientName: `Bird ${recordId}`,
    speciesKey: 'cockatiel',
    speciesName: 'Cockatiel',
    agent: 'isoflurane',
    agentBasis: 'Isoflurane, from the linked plan',
    airway: 'mask',
    staffInitials: 'AK',
    procedureName: 'Radiograph',
    startedAt: '2026-11-02T09:00:00.000Z',
    endedAt: '2026-11-02T09:40:00.000Z',
    bodyMassG: 90,
    skipped: null,
    milestones: [
      {
        id: 'standing',
        ...standing,
        ratio,
        skipped: ratio === null ? 'no standing / perching event logged' : null,
      },
      { id: 'firstMovement', observedMin: 3, predictedMin: 2, ratio: 1.5, skipped: null },
    ],
    extubationMin: null,
    notes: [],
    exclusion: excluded
      ? { reason: 'premedicated', enteredBy: 'RW', enteredAt: '2026-11-03T10:00:00Z' }
      : null,
  };
}

const { width, height, margin } = evidenceChartSize;

describe('the predicted-vs-observed chart', () => {
  const rows = [
    row(1, { observedMin: 3, predictedMin: 2 }), // x1.5: on the band's upper edge
    row(2, { observedMin: 2, predictedMin: 3 }), // /1.5: on the lower edge
    row(3, { observedMin: 20, predictedMin: 10 }), // x2: outside
    row(4, { observedMin: 4, predictedMin: 5 }, true), // within, left out of the calibration
    row(5, { observedMin: null, predictedMin: null }), // skipped: not drawn
  ];
  const chart = evidenceChartData(rows, 'standing');

  it('draws one point per record with both minutes, hollow when left out', () => {
    expect(chart.points.map((point) => [point.id, point.x, point.y, point.excluded])).toEqual([
      [1, 2, 3, false],
      [2, 3, 2, false],
      [3, 10, 20, false],
      [4, 5, 4, true],
    ]);
  });

  it('counts the records within x1.5 either way, the edges included', () => {
    expect(evidenceBandFactor).toBe(1.5);
    expect(chart.within).toBe(3);
  });

  it('runs both log axes from the smallest value / 1.6 to the largest x 1.6, with the ticks inside', () => {
    expect(chart.low).toBeCloseTo(2 / 1.6, 12);
    expect(chart.high).toBeCloseTo(20 * 1.6, 12);
    expect(chart.ticks).toEqual([2, 5, 10, 20]);
    expect(chart.x(chart.low)).toBeCloseTo(margin.left, 9);
    expect(chart.x(chart.high)).toBeCloseTo(width - margin.right, 9);
    expect(chart.y(chart.low)).toBeCloseTo(height - margin.bottom, 9);
    expect(chart.y(chart.high)).toBeCloseTo(margin.top, 9);
    // Log scale: 2 to 20 min is as long as 1 to 10 min would be, one decade.
    expect(chart.x(20) - chart.x(2)).toBeCloseTo(chart.x(10) - chart.x(1), 9);
  });

  it('draws the identity line corner to corner and the band between x1.5 and /1.5', () => {
    expect(chart.line(1)).toBe(
      `M${chart.x(chart.low)},${chart.y(chart.low)} L${chart.x(chart.high)},${chart.y(chart.high)}`,
    );
    expect(chart.band.startsWith(chart.line(1.5))).toBe(true);
    expect(chart.band).toContain(`L${chart.x(chart.high)},${chart.y(chart.high / 1.5)}`);
    expect(chart.band.endsWith(`L${chart.x(chart.low)},${chart.y(chart.low / 1.5)} Z`)).toBe(true);
    // The band is parallel to the identity line on log axes: a constant vertical offset.
    const offset = chart.y(4) - chart.y(4 * 1.5);
    expect(chart.y(12) - chart.y(12 * 1.5)).toBeCloseTo(offset, 9);
  });

  it('shows 0.5 to 60 min when no record has the milestone, never below 0.05 min', () => {
    const empty = evidenceChartData([row(9, { observedMin: null, predictedMin: null })], 'standing');
    expect(empty.points).toEqual([]);
    expect([empty.low, empty.high, empty.within]).toEqual([0.5, 60, 0]);
    expect(empty.ticks).toEqual([0.5, 1, 2, 5, 10, 20, 50]);
    const tiny = evidenceChartData([row(10, { observedMin: 0.06, predictedMin: 0.05 })], 'standing');
    expect(tiny.low).toBe(0.05);
  });

  it('reads the milestone asked for', () => {
    const firstMovement = evidenceChartData(rows, 'firstMovement');
    expect(firstMovement.points).toHaveLength(5);
    expect(firstMovement.within).toBe(5);
  });
});
