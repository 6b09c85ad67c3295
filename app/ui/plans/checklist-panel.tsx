import { memo } from 'react';
import { checklistItems, checklistStates, type Checklist } from '../../contract/plan-records.js';
import { asaMortality, asaMortalityText } from '../../core/worksheet.js';
import { SelectField, TextField } from '../common/fields.js';

type Props = { readonly checklist: Checklist; readonly onChange: (checklist: Checklist) => void };

/** The pre-anaesthetic checklist kept with the plan; open items show on the worksheet. */
export const ChecklistPanel = memo(function ChecklistPanel({ checklist, onChange }: Props) {
  const open = checklistItems.filter((item) => checklist.items[item.key] === 'open').length;
  return (
    <section className="panel" aria-labelledby="checklist-heading">
      <h2 id="checklist-heading">
        Pre-anaesthetic checklist{' '}
        <span className="muted">({open === 0 ? 'all items addressed' : `${open} open`})</span>
      </h2>
      <div className="form-grid">
        <SelectField
          label="ASA grade"
          name="asaGrade"
          value={checklist.asaGrade === null ? '' : String(checklist.asaGrade)}
          options={[
            { value: '', label: 'not graded yet' },
            ...[1, 2, 3, 4, 5].map((grade) => ({
              value: String(grade),
              label: `ASA ${grade} (${asaMortality.percentByGrade[grade as 1 | 2 | 3 | 4 | 5]} % died within 48 h)`,
            })),
          ]}
          hint={
            checklist.asaGrade === null
              ? `ASA grade not set. Published avian mortality: ${asaMortality.source}.`
              : `${asaMortalityText(checklist.asaGrade)}.`
          }
          onChange={(value) => onChange({ ...checklist, asaGrade: value === '' ? null : Number(value) })}
        />
        <div className="field checkbox">
          <input
            id="checklist-emergency"
            type="checkbox"
            checked={checklist.emergency}
            onChange={(event) => onChange({ ...checklist, emergency: event.target.checked })}
          />
          <label htmlFor="checklist-emergency">Emergency (E)</label>
        </div>
        {checklistItems.map((item) => (
          <SelectField
            key={item.key}
            label={item.label}
            name={item.key}
            value={checklist.items[item.key]}
            options={checklistStates.map((state) => ({ value: state, label: state }))}
            onChange={(value) => onChange({ ...checklist, items: { ...checklist.items, [item.key]: value } })}
          />
        ))}
      </div>
      <TextField
        label="Checklist notes"
        name="checklistNotes"
        multiline
        value={checklist.notes}
        onChange={(value) => onChange({ ...checklist, notes: value })}
      />
    </section>
  );
});
