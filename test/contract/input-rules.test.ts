import { describe, expect, it } from 'vitest';
import {
  addDays,
  bodyMassG,
  calendarDate,
  calendarDateTime,
  entryTimeProblem,
  freeText,
  hatchDateProblem,
  hiddenCharacterProblem,
  localDateOf,
  namingText,
  optionalNamingText,
  plannedDateProblem,
  recordAgentProblem,
  weighingDateProblem,
} from '../../app/contract/input-rules.js';
import { patientValuesSchema, procedureRecordValuesSchema } from '../../app/contract/records.js';

const firstMessage = (result: { success: boolean; error?: { issues: { message: string }[] } }) =>
  result.error?.issues[0]?.message;

describe('calendar dates', () => {
  // Days per month and leap years: Gregorian calendar (ISO 8601).
  it.each(['2023-02-30', '2024-13-45', '0000-00-00', '2023-04-31', '2023-02-29', '2024-1-05', ' 2024-01-05'])(
    'refuses %s',
    (text) => {
      const result = calendarDate('Hatch date').safeParse(text);
      expect(result.success).toBe(false);
      expect(firstMessage(result)).toContain('Hatch date');
    },
  );

  it.each(['2024-02-29', '2000-02-29', '1900-01-01', '2100-12-31'])('accepts %s', (text) => {
    expect(calendarDate('Hatch date').safeParse(text).success).toBe(true);
  });

  it('refuses years outside 1900 to 2100 with a message that says so', () => {
    for (const text of ['1899-12-31', '2101-01-01', '9999-12-31', '0001-01-01']) {
      const result = calendarDate('Weighing date').safeParse(text);
      expect(firstMessage(result)).toBe('Weighing date must lie between 1900 and 2100; check the year.');
    }
  });

  it('checks date-times on the calendar too', () => {
    expect(calendarDateTime('Start').safeParse('2023-02-30T10:00:00Z').success).toBe(false);
    expect(calendarDateTime('Start').safeParse('0000-01-01T00:00:00Z').success).toBe(false);
    expect(calendarDateTime('Start').safeParse('2024-02-29T23:59:59.999+02:00').success).toBe(true);
  });

  it('moves dates by days across month and leap-year ends', () => {
    expect(addDays('2024-02-28', 1)).toBe('2024-02-29');
    expect(addDays('2023-02-28', 1)).toBe('2023-03-01');
    expect(addDays('2026-12-02', -366)).toBe('2025-12-01');
    expect(localDateOf(new Date(2026, 0, 5, 23, 59))).toBe('2026-01-05');
  });
});

describe('dates against today', () => {
  const today = '2026-12-02';
  it('refuses a hatch date after today and accepts today', () => {
    expect(hatchDateProblem('2026-12-03', today)).toContain('Hatch date 2026-12-03 is after today');
    expect(hatchDateProblem(today, today)).toBeNull();
    expect(hatchDateProblem(null, today)).toBeNull();
  });

  it('refuses a future weighing even with a reason, and an old one without a reason', () => {
    expect(weighingDateProblem('2026-12-03', today, true)).toContain('after today');
    expect(weighingDateProblem('2024-06-01', today, false)).toContain('more than a year ago');
    expect(weighingDateProblem('2024-06-01', today, true)).toBeNull();
    expect(weighingDateProblem('2025-12-02', today, false)).toBeNull();
  });

  it('keeps planned dates within a year either side unless a reason is given', () => {
    expect(plannedDateProblem('2028-01-01', today, false)).toContain('more than a year ahead');
    expect(plannedDateProblem('2020-01-01', today, false)).toContain('more than a year ago');
    expect(plannedDateProblem('2028-01-01', today, true)).toBeNull();
    expect(plannedDateProblem('2027-06-01', today, false)).toBeNull();
  });
});

describe('entry times within their record', () => {
  const record = { startedAt: '2026-12-01T09:00:00.000Z', endedAt: '2026-12-01T10:00:00.000Z' };
  const now = new Date('2026-12-02T12:00:00Z');
  it('accepts the stated tolerances and refuses beyond them', () => {
    expect(entryTimeProblem('2026-12-01T08:00:00.000Z', record, now)).toBeNull();
    expect(entryTimeProblem('2026-12-01T07:59:00.000Z', record, now)).toContain(
      'before the procedure started',
    );
    expect(entryTimeProblem('2026-12-01T16:00:00.000Z', record, now)).toBeNull();
    expect(entryTimeProblem('2026-12-01T16:01:00.000Z', record, now)).toContain('after the procedure ended');
    expect(entryTimeProblem('2019-12-01T09:30:00.000Z', record, now)).toContain('before');
  });

  it('refuses a future time while the record is open', () => {
    const open = { startedAt: '2026-12-02T11:00:00.000Z', endedAt: null };
    expect(entryTimeProblem('2026-12-02T12:04:00.000Z', open, now)).toBeNull();
    expect(entryTimeProblem('2026-12-02T12:30:00.000Z', open, now)).toContain('in the future');
  });

  it('refuses a record that ends before or when it starts', () => {
    const base = {
      startedAt: '2026-12-01T09:00:00.000Z',
      procedureName: 'Beak trim',
      airway: 'mask',
      circuit: 'nonRebreathing',
      staffInitials: 'RW',
    };
    for (const endedAt of ['2026-12-01T08:59:59.000Z', '2026-12-01T09:00:00.000Z']) {
      const result = procedureRecordValuesSchema.safeParse({ ...base, endedAt });
      expect(result.error?.issues[0]).toMatchObject({
        path: ['endedAt'],
        message: 'End must be after the start; check the date and time of both.',
      });
    }
    expect(procedureRecordValuesSchema.safeParse({ ...base, endedAt: '2026-12-01T09:40:00Z' }).success).toBe(
      true,
    );
  });
});

describe('the agent of a procedure record', () => {
  const base = {
    startedAt: '2026-12-01T09:00:00.000Z',
    procedureName: 'Beak trim',
    airway: 'mask',
    circuit: 'nonRebreathing',
    staffInitials: 'RW',
  };

  it('takes one of the agents, or none (not recorded), and names the list otherwise', () => {
    expect(procedureRecordValuesSchema.parse({ ...base, agent: 'sevoflurane' }).agent).toBe('sevoflurane');
    expect(procedureRecordValuesSchema.parse(base).agent).toBeNull();
    for (const agent of ['halothane', 'Isoflurane', '', 3]) {
      const result = procedureRecordValuesSchema.safeParse({ ...base, agent });
      expect(result.error?.issues[0]).toMatchObject({
        path: ['agent'],
        message: 'Choose the anaesthetic agent given: isoflurane, sevoflurane or desflurane.',
      });
    }
  });

  it('lets a correction change a recorded agent but not remove it', () => {
    expect(recordAgentProblem('isoflurane', 'sevoflurane')).toBeNull();
    expect(recordAgentProblem(null, null)).toBeNull();
    expect(recordAgentProblem(null, 'desflurane')).toBeNull();
    expect(recordAgentProblem('sevoflurane', null)).toBe(
      'The record names Sevoflurane as the agent given; choose the agent given (a recorded agent can be corrected, not removed).',
    );
  });
});

describe('names and initials', () => {
  const initials = namingText('Name or initials', { max: 80 });
  // Characters from the Unicode Standard: U+200B zero width space, U+202E right-to-left override,
  // U+2066 left-to-right isolate, U+001B escape, U+009B control sequence introducer.
  it.each([
    ['\u200b', 'must contain at least one letter or digit'],
    ['\u200b\u200c\u2060', 'must contain at least one letter or digit'],
    ['--', 'must contain at least one letter or digit'],
    ['R\u0000W', 'control character'],
    ['\u001b[31mRW', 'control character'],
    ['R\u009bW', 'control character'],
    ['R\nW', 'control character'],
    ['\u202eWR', 'text-direction'],
    ['R\u2066W', 'text-direction'],
    ['R\ud800W', 'broken character'],
    ['\udc00', 'broken character'],
  ])('refuses %j', (text, fragment) => {
    const result = initials.safeParse(text);
    expect(firstMessage(result)).toContain(fragment);
    expect(firstMessage(result)).toContain('Name or initials');
  });

  // 'RW\n' is trimmed to 'RW': a line break at the edge is whitespace, which trim removes.
  it.each(['RW', 'RW\n', 'Zoë', '小林', 'Ølstad', '7', 'R.W. 🦜'])('accepts %j', (text) => {
    expect(initials.safeParse(text).success).toBe(true);
  });

  it('keeps line breaks in notes but refuses escape sequences there', () => {
    const notes = freeText('Notes', { max: 100, multiLine: true });
    expect(notes.safeParse('line one\nline two\ttabbed').success).toBe(true);
    expect(firstMessage(notes.safeParse('red \u001b[31m'))).toContain('Notes contains a control character');
    expect(hiddenCharacterProblem('Notes', 'a\u202eb', true)).toContain('text-direction');
  });

  it('lets an optional identifier stay blank but not invisible', () => {
    const ring = optionalNamingText('Ring ID', { max: 60 });
    expect(ring.safeParse('').success).toBe(true);
    expect(ring.safeParse(undefined).data).toBe('');
    expect(firstMessage(ring.safeParse('\u200b'))).toContain('Ring ID must contain at least one letter');
  });

  it('names the hatch date in the patient schema', () => {
    const result = patientValuesSchema.safeParse({
      name: 'Pip',
      speciesKey: 'budgerigar',
      hatchDate: '2023-02-30',
    });
    expect(result.error?.issues[0]?.path).toEqual(['hatchDate']);
    expect(firstMessage(result)).toContain('Hatch date "2023-02-30" is not a date on the calendar');
  });
});

describe('body mass', () => {
  const mass = bodyMassG('Weight');
  it('accepts 0.5 g to 200 kg and refuses the rest with one clear message', () => {
    expect(mass.safeParse(0.5).success).toBe(true);
    expect(mass.safeParse(200_000).success).toBe(true);
    for (const value of [0.49, 5e-324, 0, -1, 200_000.1, Number.POSITIVE_INFINITY, Number.NaN]) {
      const result = mass.safeParse(value);
      expect(result.success).toBe(false);
    }
    expect(firstMessage(mass.safeParse(5e-324))).toBe(
      'Weight must be between 0.5 g and 200000 g (200 kg); check the scale and the unit.',
    );
    expect(firstMessage(mass.safeParse('12'))).toBe('Weight must be a number in grams.');
  });
});
