import { describe, expect, it } from 'vitest';
import { recordAgentOf, recordLogOf } from '../../app/contract/evidence-channels.js';
import type { ProcedureRecord } from '../../app/contract/records.js';
import { planInputFromLog } from '../../app/core/evidence/record-log.js';
import { nothingMeasured } from '../support/clinic-birds.js';

/** A record of an invented cockatiel, as stored; `agent` null as on records made before agents were logged. */
function record(agent: ProcedureRecord['values']['agent']): ProcedureRecord {
  return {
    id: 7,
    patientId: 3,
    values: {
      planId: null,
      startedAt: '2026-12-01T09:00:00.000Z',
      endedAt: null,
      asaGrade: null,
      emergency: false,
      procedureName: 'Beak trim',
      fasting: '',
      cropChecked: 'not checked',
      airway: 'mask',
      tubeSizeMm: null,
      tubeType: '',
      circuit: 'nonRebreathing',
      agent,
      staffInitials: 'RW',
      promptIntervalMin: 5,
    },
    stamp: {
      versionId: 9,
      enteredAt: '2026-12-01T09:00:00.000Z',
      enteredBy: 'RW',
      reason: '',
      correctsId: null,
    },
  };
}

const dial = {
  id: 1,
  recordId: 7,
  voided: false,
  workstationName: null,
  stamp: {
    versionId: 1,
    enteredAt: '2026-12-01T09:02:00.000Z',
    enteredBy: 'RW',
    reason: '',
    correctsId: null,
  },
  values: {
    ...nothingMeasured,
    at: '2026-12-01T09:02:00.000Z',
    kind: 'vitals' as const,
    vaporPct: 4,
    oxygenLpm: 1,
  },
};

describe('the agent a record is read with', () => {
  it('is the one logged on the record, before the linked plan’s and the clinic’s default', () => {
    expect(recordAgentOf(record('sevoflurane'), { agent: 'isoflurane' }, 'desflurane')).toEqual({
      agent: 'sevoflurane',
      basis: 'Sevoflurane, logged on the record',
    });
    expect(recordAgentOf(record(null), { agent: 'isoflurane' }, 'desflurane')).toEqual({
      agent: 'isoflurane',
      basis: 'Isoflurane, from the linked plan',
    });
    expect(recordAgentOf(record(null), null, 'desflurane')).toEqual({
      agent: 'desflurane',
      basis: "Desflurane, the clinic's default agent (no plan is linked to the record)",
    });
  });

  it('reaches the log read as a plan and its notes, which the forecast and the evidence show', () => {
    const read = (agent: ProcedureRecord['values']['agent']) => {
      const logged = recordLogOf(record(agent), [dial], {
        bodyMassG: 95,
        speciesKey: 'cockatiel',
        plan: null,
        defaultAgent: 'isoflurane',
      });
      if (!logged.ok) throw new Error(logged.missing);
      const plan = planInputFromLog(logged.log);
      if (!plan.ok) throw new Error(plan.missing);
      return plan;
    };
    const logged = read('sevoflurane');
    expect(logged.input.agent).toBe('sevoflurane');
    expect(logged.notes[0]).toBe('Agent: Sevoflurane, logged on the record.');
    const fallback = read(null);
    expect(fallback.input.agent).toBe('isoflurane');
    expect(fallback.notes[0]).toBe(
      "Agent: Isoflurane, the clinic's default agent (no plan is linked to the record).",
    );
  });
});
