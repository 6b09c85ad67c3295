/**
 * Property-based bad input (fast-check, bounded runs with a fixed seed so a failure can be
 * replayed): generated numbers and texts through the real dispatcher and database.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hasLetterOrDigit, hiddenCharacterProblem } from '../../app/contract/input-rules.js';
import {
  corpusToday,
  expectRefused,
  fingerprint,
  meta,
  openClinic,
  validPatient,
  validVitals,
  validWeight,
  type Clinic,
} from './clinic-fixture.js';

const settings = { numRuns: 60, seed: 20_261_202 } as const;

/** Every number in an answer, however deep. */
function numbersIn(value: unknown): number[] {
  if (typeof value === 'number') return [value];
  if (typeof value !== 'object' || value === null) return [];
  return Object.values(value).flatMap(numbersIn);
}

/** A name made of letters with one character put in the middle, so trimming cannot remove it. */
const nameAround = (inner: fc.Arbitrary<string>) =>
  fc
    .tuple(fc.stringMatching(/^[A-Za-z]{1,10}$/), inner, fc.stringMatching(/^[A-Za-z]{1,10}$/))
    .map(([before, middle, after]) => `${before}${middle}${after}`);

const fromCodes = (ranges: readonly (readonly [number, number])[]) =>
  fc.oneof(...ranges.map(([min, max]) => fc.integer({ min, max }))).map((code) => String.fromCharCode(code));

/** C0 controls, DEL and C1 controls (Unicode Standard, General Category Cc). */
const controlCharacter = fromCodes([
  [0x00, 0x1f],
  [0x7f, 0x9f],
]);
/** Bidi embeddings, overrides and isolates (Unicode Standard Annex 9). */
const bidiControl = fromCodes([
  [0x202a, 0x202e],
  [0x2066, 0x2069],
]);
/** One half of a surrogate pair on its own. */
const loneSurrogate = fromCodes([[0xd800, 0xdfff]]);
/** Characters that show nothing: spaces, zero-width characters, soft hyphen, word joiner. */
const invisible = fc.constantFrom(
  ' ',
  '\u00a0',
  '\u200b',
  '\u200c',
  '\u200d',
  '\u2060',
  '\u00ad',
  '\u3000',
  '\ufeff',
);

describe('generated bad input is refused with the field named and the database unchanged', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
  });
  afterAll(() => clinic.close());

  it('refuses every body mass outside 0.5 g to 200 kg, and every non-finite one', async () => {
    const badMass = fc.oneof(
      fc.double({ max: 0.4999999999, noNaN: true }),
      fc.double({ min: 200_000.000001, noNaN: true }),
      fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 5e-324, -0, 0),
    );
    await fc.assert(
      fc.asyncProperty(badMass, async (massG) => {
        await expectRefused(
          clinic,
          'weights:add',
          { patientId: clinic.ids.pip, values: { ...validWeight, massG }, meta },
          { code: 'invalid-request', field: 'values.massG' },
        );
      }),
      settings,
    );
  });

  it('refuses heart rates outside 0 to 1200 /min', async () => {
    const badRate = fc.oneof(
      fc.double({ max: -Number.EPSILON, noNaN: true }),
      fc.double({ min: 1200.000001, noNaN: true }),
      fc.constant(Number.NaN),
    );
    await fc.assert(
      fc.asyncProperty(badRate, async (heartRatePerMin) => {
        await expectRefused(
          clinic,
          'entries:add',
          { recordId: clinic.ids.record, values: { ...validVitals, heartRatePerMin }, meta },
          { code: 'invalid-request', field: 'values.heartRatePerMin' },
        );
      }),
      settings,
    );
  });

  it('refuses a name that holds a control, text-direction or broken character anywhere inside', async () => {
    const hidden = fc.oneof(controlCharacter, bidiControl, loneSurrogate);
    await fc.assert(
      fc.asyncProperty(nameAround(hidden), async (name) => {
        await expectRefused(
          clinic,
          'patients:create',
          { values: { ...validPatient, name }, meta },
          { code: 'invalid-request', field: 'values.name', says: 'Name or ID contains' },
        );
      }),
      settings,
    );
  });

  it('refuses initials made only of invisible characters on every writing channel tried', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(invisible, { minLength: 1, maxLength: 6 }).map((parts) => parts.join('')),
        async (enteredBy) => {
          await expectRefused(
            clinic,
            'weights:add',
            { patientId: clinic.ids.pip, values: validWeight, meta: { enteredBy, reason: '' } },
            { code: 'invalid-request', field: 'meta.enteredBy' },
          );
          await expectRefused(
            clinic,
            'safety:acknowledge',
            { acknowledgedBy: enteredBy, accepted: true },
            { code: 'invalid-request', field: 'acknowledgedBy' },
          );
        },
      ),
      settings,
    );
  });

  it('either keeps a name that shows a letter or digit and hides nothing, or refuses it naming the field', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ unit: 'binary', minLength: 1, maxLength: 12 }), async (name) => {
        const trimmed = name.trim();
        const acceptable =
          trimmed !== '' && hasLetterOrDigit(trimmed) && hiddenCharacterProblem('Name', trimmed) === null;
        const before = fingerprint(clinic.db);
        const answer = await clinic.dispatch('patients:create', { values: { ...validPatient, name }, meta });
        expect(answer.ok).toBe(acceptable);
        if (!answer.ok) {
          expect((answer.error as { field?: string }).field).toBe('values.name');
          expect(fingerprint(clinic.db)).toBe(before);
        } else expect((answer.value as { values: { name: string } }).values.name).toBe(trimmed);
      }),
      { ...settings, numRuns: 80 },
    );
  });

  it('keeps a hatch date only when it is on the calendar, from 1900, and not after today', async () => {
    const pad = (value: number, width: number) => String(value).padStart(width, '0');
    const dateText = fc
      .tuple(
        fc.integer({ min: 0, max: 9999 }),
        fc.integer({ min: 0, max: 13 }),
        fc.integer({ min: 0, max: 32 }),
      )
      .map(([year, month, day]) => ({
        year,
        month,
        day,
        text: `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`,
      }));
    await fc.assert(
      fc.asyncProperty(dateText, async ({ year, month, day, text }) => {
        // Independent oracle: the JavaScript Date rolls an impossible day over into the next month.
        const probe = new Date(Date.UTC(2000, 0, 1));
        probe.setUTCFullYear(year, month - 1, day);
        const onCalendar =
          month >= 1 &&
          probe.getUTCFullYear() === year &&
          probe.getUTCMonth() === month - 1 &&
          probe.getUTCDate() === day;
        const acceptable = onCalendar && year >= 1900 && text <= corpusToday;
        const before = fingerprint(clinic.db);
        const answer = await clinic.dispatch('patients:create', {
          values: { ...validPatient, hatchDate: text },
          meta,
        });
        expect(answer.ok, text).toBe(acceptable);
        if (!answer.ok) {
          expect((answer.error as { field?: string }).field).toBe('values.hatchDate');
          expect(fingerprint(clinic.db)).toBe(before);
        }
      }),
      { ...settings, numRuns: 80 },
    );
  });

  it('opens the patient after any run of accepted weights, with every figure of the trend finite', async () => {
    const mass = fc.double({ min: 0.5, max: 200_000, noNaN: true });
    await fc.assert(
      fc.asyncProperty(fc.array(mass, { minLength: 1, maxLength: 4 }), async (masses) => {
        const created = await clinic.dispatch('patients:create', { values: validPatient, meta });
        const patientId = (created.value as { id: number }).id;
        for (const [index, massG] of masses.entries()) {
          const added = await clinic.dispatch('weights:add', {
            patientId,
            values: { ...validWeight, weighedOn: `${corpusToday.slice(0, 8)}0${String(index + 1)}`, massG },
            meta,
          });
          expect(added.ok).toBe(true);
        }
        const opened = await clinic.dispatch('patients:get', { id: patientId });
        expect(opened.ok).toBe(true);
        const trend = (opened.value as { trend: unknown }).trend;
        expect(numbersIn(trend).every(Number.isFinite)).toBe(true);
      }),
      { ...settings, numRuns: 30 },
    );
  });
});
