/**
 * Bad text on every channel that stores text: each case names the exact field refused, and the
 * database is byte-for-byte the same afterwards.
 */
import { afterAll, beforeAll, describe, it } from 'vitest';
import {
  correction,
  corpusToday,
  expectRefused,
  meta,
  openClinic,
  pipPlanInput,
  validChecklist,
  validDrug,
  validEvent,
  validPatient,
  validRecord,
  validSpecies,
  validVitals,
  validWeight,
  type Clinic,
} from './clinic-fixture.js';
import { heronLaneSettings } from '../support/clinic-settings.js';

type Ids = Clinic['ids'];
/**
 * How a field is checked: a required name, a required reason (a name that may span lines), an
 * optional identifier, one line of free text, or notes.
 */
type Kind = 'naming' | 'reason' | 'optionalNaming' | 'free' | 'notes';
type TextField = {
  readonly channel: string;
  readonly field: string;
  readonly kind: Kind;
  readonly max: number;
  readonly payload: (value: unknown, ids: Ids) => unknown;
};

/** Sets `value` at a dotted path in a copy of `base`. */
function withValue(base: Record<string, unknown>, dotted: string, value: unknown): Record<string, unknown> {
  const copy = structuredClone(base);
  const parts = dotted.split('.');
  let target = copy;
  for (const part of parts.slice(0, -1)) target = target[part] as Record<string, unknown>;
  target[parts.at(-1) as string] = value;
  return copy;
}

function field(
  channel: string,
  dotted: string,
  kind: Kind,
  max: number,
  base: (ids: Ids) => Record<string, unknown>,
): TextField {
  return { channel, field: dotted, kind, max, payload: (value, ids) => withValue(base(ids), dotted, value) };
}

const planFields = (patientId: number | null) => ({
  patientId,
  plannedFor: corpusToday,
  label: 'Beak trim',
  input: pipPlanInput,
  checklist: validChecklist,
});

const textFields: TextField[] = [
  field('safety:acknowledge', 'acknowledgedBy', 'naming', 80, () => ({
    acknowledgedBy: 'RW',
    accepted: true,
  })),
  field('settings:save', 'clinicName', 'naming', 120, () => ({ ...heronLaneSettings })),
  field('settings:save', 'addressLine', 'free', 200, () => ({ ...heronLaneSettings })),
  field('workstation:save', 'name', 'naming', 80, () => ({ name: 'Theatre 1' })),
  field('workstation:save', 'initials', 'optionalNaming', 40, () => ({ initials: 'RW' })),
  field('species:add', 'values.commonName', 'naming', 120, () => ({ values: validSpecies, meta })),
  field('species:add', 'values.scientificName', 'optionalNaming', 120, () => ({
    values: validSpecies,
    meta,
  })),
  field('species:add', 'values.massBasis', 'naming', 300, () => ({ values: validSpecies, meta })),
  field('species:add', 'meta.enteredBy', 'naming', 80, () => ({ values: validSpecies, meta })),
  field('species:add', 'meta.reason', 'notes', 500, () => ({ values: validSpecies, meta })),
  field('patients:create', 'values.name', 'naming', 120, () => ({ values: validPatient, meta })),
  field('patients:create', 'values.ringId', 'optionalNaming', 60, () => ({ values: validPatient, meta })),
  field('patients:create', 'values.microchipId', 'optionalNaming', 60, () => ({
    values: validPatient,
    meta,
  })),
  field('patients:create', 'values.ownerReference', 'optionalNaming', 120, () => ({
    values: validPatient,
    meta,
  })),
  field('patients:create', 'values.ageText', 'free', 60, () => ({ values: validPatient, meta })),
  field('patients:create', 'values.notes', 'notes', 4000, () => ({ values: validPatient, meta })),
  field('patients:create', 'meta.enteredBy', 'naming', 80, () => ({ values: validPatient, meta })),
  field('patients:correct', 'meta.reason', 'reason', 500, (ids) => ({
    id: ids.pip,
    values: validPatient,
    meta: correction,
  })),
  field('patients:correct', 'values.name', 'naming', 120, (ids) => ({
    id: ids.pip,
    values: validPatient,
    meta: correction,
  })),
  field('weights:add', 'values.weighedBy', 'optionalNaming', 80, (ids) => ({
    patientId: ids.pip,
    values: validWeight,
    meta,
  })),
  field('weights:add', 'meta.enteredBy', 'naming', 80, (ids) => ({
    patientId: ids.pip,
    values: validWeight,
    meta,
  })),
  field('weights:correct', 'meta.reason', 'reason', 500, (ids) => ({
    id: ids.weight,
    values: validWeight,
    meta: correction,
  })),
  field('weights:void', 'meta.enteredBy', 'naming', 80, (ids) => ({ id: ids.weight, meta: correction })),
  field('procedures:create', 'values.procedureName', 'naming', 200, (ids) => ({
    patientId: ids.pip,
    values: validRecord,
    meta,
  })),
  field('procedures:create', 'values.staffInitials', 'naming', 40, (ids) => ({
    patientId: ids.pip,
    values: validRecord,
    meta,
  })),
  field('procedures:create', 'values.fasting', 'free', 200, (ids) => ({
    patientId: ids.pip,
    values: validRecord,
    meta,
  })),
  field('procedures:correct', 'meta.reason', 'reason', 500, (ids) => ({
    id: ids.record,
    values: validRecord,
    meta: correction,
  })),
  field('entries:add', 'values.eventNote', 'notes', 1000, (ids) => ({
    recordId: ids.record,
    values: validEvent,
    meta,
  })),
  field('entries:add', 'values.drugName', 'optionalNaming', 120, (ids) => ({
    recordId: ids.record,
    values: { ...validEvent, eventType: 'note', drugName: 'Drug A' },
    meta,
  })),
  field('entries:add', 'values.drugDose', 'free', 120, (ids) => ({
    recordId: ids.record,
    values: validEvent,
    meta,
  })),
  field('entries:add', 'meta.enteredBy', 'naming', 80, (ids) => ({
    recordId: ids.record,
    values: validVitals,
    meta,
  })),
  field('entries:correct', 'meta.reason', 'reason', 500, (ids) => ({
    id: ids.entry,
    values: validVitals,
    meta: correction,
  })),
  field('entries:void', 'meta.reason', 'reason', 500, (ids) => ({ id: ids.entry, meta: correction })),
  field('evidence:exclude', 'meta.reason', 'reason', 500, (ids) => ({
    recordId: ids.record,
    excluded: true,
    meta: correction,
  })),
  field('evidence:set-calibration', 'meta.enteredBy', 'naming', 80, () => ({ on: false, meta })),
  field('drugs:add', 'values.name', 'naming', 120, () => ({ values: validDrug, meta })),
  field('drugs:add', 'values.route', 'naming', 60, () => ({ values: validDrug, meta })),
  field('drugs:add', 'values.doseSource', 'naming', 300, () => ({ values: validDrug, meta })),
  field('drugs:add', 'values.notes', 'notes', 500, () => ({ values: validDrug, meta })),
  field('drugs:correct', 'meta.reason', 'reason', 500, (ids) => ({
    id: ids.drug,
    values: validDrug,
    meta: correction,
  })),
  field('drugs:void', 'meta.enteredBy', 'naming', 80, (ids) => ({ id: ids.drug, meta: correction })),
  field('plans:save', 'fields.label', 'free', 120, (ids) => ({ fields: planFields(ids.pip), meta })),
  field('plans:save', 'fields.checklist.notes', 'notes', 1000, (ids) => ({
    fields: planFields(ids.pip),
    meta,
  })),
  field('plans:save', 'meta.enteredBy', 'naming', 80, (ids) => ({ fields: planFields(ids.pip), meta })),
  field('plans:save', 'meta.reason', 'notes', 500, (ids) => ({ fields: planFields(ids.pip), meta })),
  field('plans:correct', 'meta.enteredBy', 'naming', 80, (ids) => ({
    id: ids.pipPlan,
    fields: planFields(ids.pip),
    meta,
  })),
];

/**
 * Bad values and the kinds of field that refuse them. Characters from the Unicode Standard:
 * U+0000 NUL, U+001B ESC (terminal escape sequences), U+007F DEL, U+009B CSI, U+200B zero width
 * space, U+202E right-to-left override, U+2067 right-to-left isolate, U+D800/U+DC00 unpaired
 * surrogates.
 */
const badValues: readonly {
  readonly label: string;
  readonly value: unknown;
  readonly refusedBy: readonly Kind[];
}[] = [
  {
    label: 'NUL inside',
    value: 'R\u0000W',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  {
    label: 'an escape sequence',
    value: '\u001b[2J\u001b[31mRW',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  { label: 'DEL', value: 'RW\u007f', refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'] },
  {
    label: 'a C1 control sequence introducer',
    value: 'R\u009b31mW',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  {
    label: 'a right-to-left override',
    value: 'RW\u202egnp.exe',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  {
    label: 'a right-to-left isolate',
    value: '\u2067RW',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  {
    label: 'a lone high surrogate',
    value: 'RW\ud800',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  {
    label: 'a lone low surrogate',
    value: '\udc00RW',
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  { label: 'a line break inside one line', value: 'R\nW', refusedBy: ['naming', 'optionalNaming', 'free'] },
  {
    label: 'a number instead of text',
    value: 42,
    refusedBy: ['naming', 'reason', 'optionalNaming', 'free', 'notes'],
  },
  { label: 'only a zero width space', value: '\u200b', refusedBy: ['naming', 'reason', 'optionalNaming'] },
  { label: 'only punctuation', value: '-- .', refusedBy: ['naming', 'reason', 'optionalNaming'] },
  { label: 'only spaces', value: '    ', refusedBy: ['naming', 'reason'] },
  { label: 'nothing', value: '', refusedBy: ['naming', 'reason'] },
];

const cases = textFields.flatMap((textField) => [
  ...badValues
    .filter((bad) => bad.refusedBy.includes(textField.kind))
    .map((bad) => ({ textField, label: bad.label, value: bad.value })),
  { textField, label: `${String(textField.max + 1)} characters`, value: 'a'.repeat(textField.max + 1) },
]);

describe('bad text is refused on every channel, naming the field, with the database unchanged', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
  });
  afterAll(() => clinic.close());

  it('covers at least 300 cases over every text-storing channel', () => {
    if (cases.length < 300) throw new Error(`only ${String(cases.length)} text cases`);
  });

  it.each(
    cases.map((entry) => [entry.textField.channel, entry.textField.field, entry.label, entry] as const),
  )('%s %s: %s', async (_channel, _field, _label, { textField, value }) => {
    await expectRefused(clinic, textField.channel, textField.payload(value, clinic.ids), {
      code: 'invalid-request',
      field: textField.field,
    });
  });
});
