import { describe, expect, it } from 'vitest';
import {
  cylinderContent,
  cylinderContentL,
  cylinderPresets,
  defaultOxygenReservePct,
  oxygenBudget,
} from '../../../app/core/budget/oxygen.js';

describe('cylinder content', () => {
  it('holds a US E cylinder within its published 622-680 L', () => {
    // US E cylinder (oxygen) 622-680 L at 2000-2200 psi full [published, secondary]
    const content = cylinderContentL({ kind: 'preset', presetId: 'us-e' });
    expect(content).toBeGreaterThanOrEqual(622);
    expect(content).toBeLessThanOrEqual(680);
    expect(cylinderPresets['us-e'].fullContentRangeL).toEqual([622, 680]);
  });

  it('gives water capacity x pressure for a metric cylinder', () => {
    // metric cylinders: content (L) = water capacity (L) x pressure (bar) [derived]
    expect(cylinderContentL({ kind: 'waterCapacity', waterCapacityL: 10, pressureBar: 200 })).toBe(2000);
    expect(cylinderContentL({ kind: 'waterCapacity', waterCapacityL: 2, pressureBar: 137 })).toBe(274);
    expect(cylinderContent({ kind: 'waterCapacity', waterCapacityL: 2, pressureBar: 137 }).kind).toBe(
      'derived',
    );
  });

  it('scales a preset by its gauge reading, in bar or psi', () => {
    // US E cylinder 622 L at 2000 psi [published, secondary]; content in proportion to pressure [derived]
    expect(cylinderContentL({ kind: 'preset', presetId: 'us-e', gaugePressurePsi: 1000 })).toBeCloseTo(
      311,
      6,
    );
    expect(
      cylinderContentL({ kind: 'preset', presetId: 'metric-10l-200bar', gaugePressureBar: 50 }),
    ).toBeCloseTo(500, 9);
  });

  it('refuses a pressure no medical cylinder holds', () => {
    expect(() => cylinderContentL({ kind: 'waterCapacity', waterCapacityL: 10, pressureBar: 900 })).toThrow(
      /pressureBar/,
    );
  });
});

describe('oxygen budget', () => {
  const eCylinder = { kind: 'preset', presetId: 'us-e' } as const;

  it('uses flow x time and lasts content above the reserve / flow', () => {
    // US E 622 L [published, secondary]; 25 % reserve is an assumption of ours
    const budget = oxygenBudget({ freshGasLpm: 1, durationMin: 90, cylinder: eCylinder });
    expect(budget.usedL).toBeCloseTo(90, 9);
    expect(budget.reservePct).toBe(defaultOxygenReservePct);
    expect(budget.usableL).toBeCloseTo(622 * 0.75, 9);
    expect(budget.enduranceMin).toBeCloseTo(466.5, 9);
    expect(budget.enduranceToEmptyMin).toBeCloseTo(622, 9);
    expect(budget.suffices).toBe(true);
  });

  it('says the cylinder does not suffice when the plan eats into the reserve', () => {
    const small = { kind: 'waterCapacity', waterCapacityL: 2, pressureBar: 50 } as const; // 100 L [derived]
    const budget = oxygenBudget({ freshGasLpm: 2, durationMin: 40, cylinder: small, reservePct: 25 });
    expect(budget.usedL).toBeCloseTo(80, 9);
    expect(budget.usableL).toBeCloseTo(75, 9);
    expect(budget.suffices).toBe(false);
    expect(oxygenBudget({ freshGasLpm: 2, durationMin: 40, cylinder: small, reservePct: 10 }).suffices).toBe(
      true,
    );
  });

  it('sums a flow schedule and rates endurance at its highest flow', () => {
    const flows = [
      { atMin: 0, freshGasLpm: 4 },
      { atMin: 5, freshGasLpm: 1 },
    ];
    const budget = oxygenBudget({ freshGasLpm: flows, durationMin: 65, cylinder: eCylinder, reservePct: 0 });
    expect(budget.usedL).toBeCloseTo(4 * 5 + 1 * 60, 9);
    expect(budget.peakFlowLpm).toBe(4);
    expect(budget.enduranceMin).toBeCloseTo(622 / 4, 9);
  });

  it('gives no endurance figure when no oxygen flows', () => {
    const budget = oxygenBudget({ freshGasLpm: 0, durationMin: 30, cylinder: eCylinder });
    expect(budget.enduranceMin).toBeNull();
    expect(budget.usedL).toBe(0);
    expect(budget.suffices).toBe(true);
  });
});
