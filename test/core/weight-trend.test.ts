import { describe, expect, it } from 'vitest';
import { lossBand, massRangeFlags, weightTrend } from '../../app/core/weight-trend.js';

const budgerigar = { minG: 25, maxG: 35, speciesName: 'budgerigar' }; // 25-35 g: typical adult mass, common practice

describe('weight-loss bands', () => {
  // Bands <5, <10, <15, <20, >20 %: IVAPM pain scale for birds
  it.each([
    [0, 'no loss'],
    [-3, 'no loss'],
    [4.99, '<5 %'],
    [5, '5-10 %'],
    [9.9, '5-10 %'],
    [10, '10-15 %'],
    [15, '15-20 %'],
    [19.99, '15-20 %'],
    [20, '>20 %'],
    [35, '>20 %'],
  ] as const)('a loss of %f %% falls in band %s', (lossPct, band) => {
    expect(lossBand(lossPct)).toBe(band);
  });
});

describe('weight trend', () => {
  it('reports the change since the previous and the first weight, whatever order the weights come in', () => {
    const trend = weightTrend(
      [
        { weighedOn: '2026-11-20', massG: 30 },
        { weighedOn: '2026-10-01', massG: 34 },
        { weighedOn: '2026-11-30', massG: 28.5 },
      ],
      budgerigar,
    );
    expect(trend.latest).toEqual({ weighedOn: '2026-11-30', massG: 28.5 });
    expect(trend.sinceLast?.grams).toBeCloseTo(-1.5, 10);
    expect(trend.sinceLast?.percent).toBeCloseTo(-5, 10);
    expect(trend.sinceLast?.lossBand).toBe('5-10 %');
    expect(trend.sinceFirst?.percent).toBeCloseTo(((28.5 - 34) / 34) * 100, 10);
    expect(trend.sinceFirst?.lossBand).toBe('15-20 %');
    expect(trend.flags.map((flag) => [flag.code, flag.severity])).toEqual([
      ['weight-loss-since-last', 'notice'],
      ['weight-loss-since-first', 'danger'],
    ]);
  });

  it('raises no loss flag when the bird gains or holds weight, and has no change with one weight', () => {
    expect(
      weightTrend(
        [
          { weighedOn: '2026-11-01', massG: 30 },
          { weighedOn: '2026-11-08', massG: 31 },
        ],
        budgerigar,
      ).flags,
    ).toEqual([]);
    const single = weightTrend([{ weighedOn: '2026-11-01', massG: 30 }], budgerigar);
    expect(single.sinceLast).toBeNull();
    expect(single.sinceFirst).toBeNull();
  });
});

describe('species range and unit slips', () => {
  it('notes a weight just outside the typical range', () => {
    expect(massRangeFlags(41, budgerigar).map((flag) => flag.code)).toEqual(['weight-outside-species-range']);
  });

  it('calls a kilogram figure typed as grams (or the reverse) a likely unit slip', () => {
    expect(massRangeFlags(0.032, budgerigar)[0]?.code).toBe('weight-unit-slip');
    expect(massRangeFlags(0.032, budgerigar)[0]?.message).toMatch(/Was 0.032 kg meant \(32 g\)\?/);
    // canary 12-30 g [common practice]: 25 kg typed where 25 g was meant
    expect(massRangeFlags(25000, { minG: 12, maxG: 30, speciesName: 'canary' })[0]?.code).toBe(
      'weight-unit-slip',
    );
  });

  it('is silent inside the range or without a species range', () => {
    expect(massRangeFlags(30, budgerigar)).toEqual([]);
    expect(massRangeFlags(30, null)).toEqual([]);
  });
});

describe('weights that cannot be compared', () => {
  const finiteEverywhere = (value: unknown): boolean =>
    typeof value === 'number'
      ? Number.isFinite(value)
      : typeof value === 'object' && value !== null
        ? Object.values(value).every(finiteEverywhere)
        : true;

  it('never returns a non-finite change when an earlier weight is 5e-324 g (the smallest double)', () => {
    const trend = weightTrend(
      [
        { weighedOn: '2026-11-01', massG: 5e-324 },
        { weighedOn: '2026-11-20', massG: 30 },
      ],
      budgerigar,
    );
    expect(finiteEverywhere(trend)).toBe(true);
    expect(trend.sinceLast).toBeNull();
    expect(trend.latest).toEqual({ weighedOn: '2026-11-20', massG: 30 });
    expect(trend.flags.map((flag) => flag.code)).toEqual(['weight-change-not-computable']);
    expect(trend.flags[0]?.message).toContain('2026-11-01 cannot be compared with the latest');
  });

  it('still reports the change since the first weight when only a middle weight is odd', () => {
    const trend = weightTrend(
      [
        { weighedOn: '2026-10-01', massG: 34 },
        { weighedOn: '2026-11-01', massG: 0 },
        { weighedOn: '2026-11-20', massG: 30 },
      ],
      budgerigar,
    );
    expect(finiteEverywhere(trend)).toBe(true);
    expect(trend.sinceLast).toBeNull();
    // (30 - 34) / 34 = -11.8 %: band 10-15 % (IVAPM pain scale for birds)
    expect(trend.sinceFirst?.lossBand).toBe('10-15 %');
  });
});
