import { describe, expect, it } from 'vitest';
import { dialSteps, fixedStripRange, stripRange } from '../../../app/ui/records/strip-ranges.js';

const celsius = { temperature: 'C', pressure: 'mmHg' } as const;

describe('fixed strip ranges of the record chart', () => {
  it('keeps a one-degree drift small: the temperature strip spans 10 °C whatever was logged', () => {
    const range = stripRange(fixedStripRange('temperatureC', celsius), [40.1, 39.1]);
    expect(range).toEqual({ min: 34, max: 44, step: 2 });
  });

  it('widens by whole steps only when a value falls outside, so nothing is drawn off the strip', () => {
    expect(stripRange(fixedStripRange('heartRatePerMin', celsius), [250, 640, null])).toEqual({
      min: 0,
      max: 700,
      step: 100,
    });
    expect(stripRange(fixedStripRange('temperatureC', celsius), [31.5])).toMatchObject({ min: 30, max: 44 });
  });

  it('uses the clinic’s units: °F and kPa ranges cover the same span', () => {
    // 34-44 °C is 93.2-111.2 °F; 80 mmHg is 10.7 kPa (760/101.325 mmHg per kPa)
    expect(fixedStripRange('temperatureC', { temperature: 'F', pressure: 'kPa' })).toMatchObject({
      min: 93,
      max: 111,
    });
    expect(fixedStripRange('etco2Mmhg', { temperature: 'F', pressure: 'kPa' })).toMatchObject({
      min: 0,
      max: 11,
    });
  });
});

describe('the dial as steps', () => {
  it('holds each setting until the next one and to the end of the axis', () => {
    expect(
      dialSteps(
        [
          { minute: 0, value: 4 },
          { minute: 4, value: 2 },
          { minute: 30, value: 0 },
        ],
        40,
      ),
    ).toEqual([
      { minute: 0, value: 4 },
      { minute: 4, value: 4 },
      { minute: 4, value: 2 },
      { minute: 30, value: 2 },
      { minute: 30, value: 0 },
      { minute: 40, value: 0 },
    ]);
  });

  it('draws nothing without a setting', () => {
    expect(dialSteps([], 10)).toEqual([]);
  });
});
