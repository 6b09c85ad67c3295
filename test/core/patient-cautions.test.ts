import { describe, expect, it } from 'vitest';
import { cautionsForPatient } from '../../app/core/patient-cautions.js';

const cautions = [{ code: 'anatomy-tracheal-bulla' }, { code: 'anatomy-dive-response' }];

describe('cautions filtered by the patient’s sex', () => {
  it('leaves the tracheal bulla out for a female (a feature of male ducks, common practice)', () => {
    expect(cautionsForPatient(cautions, 'female').map((caution) => caution.code)).toEqual([
      'anatomy-dive-response',
    ]);
  });

  it('keeps it for a male and when the sex is not known', () => {
    expect(cautionsForPatient(cautions, 'male')).toHaveLength(2);
    expect(cautionsForPatient(cautions, 'unknown')).toHaveLength(2);
    expect(cautionsForPatient(cautions, null)).toHaveLength(2);
  });
});
