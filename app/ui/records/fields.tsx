import { useId, type ReactNode } from 'react';

type TextBoxProps = {
  readonly label: string;
  readonly name: string;
  readonly value: string;
  readonly error: string | undefined;
  readonly hint?: ReactNode;
  readonly type?: 'text' | 'datetime-local';
  readonly inputMode?: 'decimal' | 'text' | 'numeric';
  readonly size?: number;
  readonly autoFocus?: boolean;
  readonly onChange: (value: string) => void;
};

/** A labelled text box with its hint and its own error message beside it. */
export function TextBox({
  label,
  name,
  value,
  error,
  hint,
  type = 'text',
  inputMode,
  size,
  autoFocus,
  onChange,
}: TextBoxProps) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <input
        id={id}
        name={name}
        type={type}
        value={value}
        inputMode={inputMode}
        size={size}
        autoFocus={autoFocus}
        aria-invalid={error !== undefined}
        aria-describedby={error !== undefined ? `${id}-error` : hint !== undefined ? `${id}-hint` : undefined}
        onChange={(event) => onChange(event.target.value)}
      />
      <FieldNotes id={id} hint={hint} error={error} />
    </div>
  );
}

/** A field's hint and its error, with the ids its control names in aria-describedby. */
function FieldNotes({ id, hint, error }: { id: string; hint: ReactNode; error: string | undefined }) {
  return (
    <>
      {hint !== undefined && (
        <p className="hint" id={`${id}-hint`}>
          {hint}
        </p>
      )}
      {error !== undefined && (
        <p className="field-error" id={`${id}-error`} role="alert">
          {error}
        </p>
      )}
    </>
  );
}

type SelectBoxProps<T extends string> = {
  readonly label: string;
  readonly name: string;
  readonly options: readonly { readonly value: T; readonly label: string }[];
  readonly value: T;
  readonly error: string | undefined;
  readonly hint?: ReactNode;
  readonly onChange: (value: T) => void;
};

/** A labelled drop-down list (arrow keys and typing a letter choose) with its hint and error. */
export function SelectBox<T extends string>({
  label,
  name,
  options,
  value,
  error,
  hint,
  onChange,
}: SelectBoxProps<T>) {
  const id = useId();
  const describedBy = [error !== undefined ? `${id}-error` : '', hint !== undefined ? `${id}-hint` : '']
    .join(' ')
    .trim();
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <select
        id={id}
        name={name}
        value={value}
        aria-invalid={error !== undefined}
        aria-describedby={describedBy === '' ? undefined : describedBy}
        onChange={(event) => {
          const chosen = options.find((option) => option.value === event.target.value);
          if (chosen !== undefined) onChange(chosen.value);
        }}
      >
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      <FieldNotes id={id} hint={hint} error={error} />
    </div>
  );
}

type RadioGroupProps<T extends string | number> = {
  readonly legend: string;
  readonly name: string;
  readonly options: readonly { readonly value: T; readonly label: string }[];
  readonly value: T;
  readonly error: string | undefined;
  readonly onChange: (value: T) => void;
};

/** A set of radio buttons with a legend and its own error message. */
export function RadioGroup<T extends string | number>({
  legend,
  name,
  options,
  value,
  error,
  onChange,
}: RadioGroupProps<T>) {
  const errorId = useId();
  return (
    <fieldset className="field choice" aria-describedby={error !== undefined ? errorId : undefined}>
      <legend>{legend}</legend>
      <div className="choice-options">
        {options.map((option) => (
          <label key={String(option.value)}>
            <input
              type="radio"
              name={name}
              value={String(option.value)}
              checked={value === option.value}
              onChange={() => onChange(option.value)}
            />
            {option.label}
          </label>
        ))}
      </div>
      {error !== undefined && (
        <p className="field-error" id={errorId} role="alert">
          {error}
        </p>
      )}
    </fieldset>
  );
}
