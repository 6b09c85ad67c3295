import { readFileSync } from 'node:fs';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterEach, describe, expect, it } from 'vitest';
import { planInputSchema } from '../../app/contract/plan.js';
import { defaultClinicSettings } from '../../app/contract/settings.js';
import { setClinicDateFormat } from '../../app/ui/common/display.js';
import { PrintedRecord } from '../../app/ui/records/printed-record.js';
import { Sheet } from '../../app/ui/worksheets/sheet.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { enteredByRw, pipRadiographValues, pipValues } from '../support/clinic-birds.js';

const pipInput = planInputSchema.parse(
  JSON.parse(
    readFileSync(
      new URL('../../examples/plans/pip-budgerigar-mask-isoflurane.json', import.meta.url),
      'utf8',
    ),
  ),
);

/** The page's text, one line per element. */
function textOf(markup: string): string {
  return markup
    .replace(/<[^>]*>/g, '\n')
    .replace(/&amp;/g, '&')
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/\s+/g, ' ');
}

/** Printed at 14:05 local time on 2 December 2026, whatever the time zone the tests run in. */
const printedAt = new Date(2026, 11, 2, 14, 5);
const settings = {
  ...defaultClinicSettings,
  clinicName: 'Harbour Bird Clinic',
  dateFormat: 'D MMM YYYY',
} as const;

describe('the printed worksheet and record follow the clinic date format', () => {
  const open: ChannelHarness[] = [];
  afterEach(() => {
    open.splice(0).forEach((harness) => harness.close());
    setClinicDateFormat(undefined);
  });

  it('prints the worksheet\'s "printed" line and the record\'s stamps in the clinic format', async () => {
    const api = openChannelHarness();
    open.push(api);
    const patient = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const saved = await api.answer('plans:save', {
      fields: {
        patientId: patient.id,
        plannedFor: '2026-12-02',
        label: 'Wing radiograph',
        input: pipInput,
        checklist: { asaGrade: 2, emergency: false, notes: '' },
      },
      meta: enteredByRw,
    });
    const sheet = textOf(
      renderToStaticMarkup(
        createElement(Sheet, {
          detail: await api.answer('plans:get', { id: saved.id }),
          drugs: [],
          appVersion: '9.8.7',
          settings,
          printedAt,
          calibration: null,
        }),
      ),
    );
    expect(sheet).toContain('printed 2 Dec 2026 14:05');

    const started = new Date(2026, 11, 1, 10, 0).toISOString();
    const ended = new Date(2026, 11, 1, 10, 40).toISOString();
    api.clock.set(ended);
    const record = await api.answer('procedures:create', {
      patientId: patient.id,
      values: { ...pipRadiographValues, startedAt: started, endedAt: ended },
      meta: enteredByRw,
    });
    const printed = textOf(
      renderToStaticMarkup(
        createElement(PrintedRecord, {
          detail: await api.answer('procedures:get', { id: record.id }),
          histories: {},
          plan: null,
          voided: [],
          settings,
          appVersion: '9.8.7',
          printedAt,
        }),
      ),
    );
    expect(printed).toContain(`Record ${String(record.id)} · 1 Dec 2026 10:00`);
    expect(printed).toContain('1 Dec 2026 10:00 to 1 Dec 2026 10:40');
    expect(printed).toContain('printed 2 Dec 2026 14:05');
  });
});
