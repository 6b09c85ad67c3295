import { useId, type ReactNode } from 'react';

type Base = {
  readonly label: string;
  readonly error?: string | undefined;
  readonly hint?: ReactNode;
  readonly autoFocus?: boolean;
  readonly name?: string;
};

function FieldMessages({
  id,
  error,
  hint,
}: {
  readonly id: string;
  readonly error: string | undefined;
  readonly hint: ReactNode;
}) {
  return (
    <>
      {hint !== undefined && <p className="hint">{hint}</p>}
      {error !== undefined && (
        // Not an alert: the form's one status line announces the failed save, and focus moves to
        // the first field in error, whose description is this message.
        <p className="field-error" id={`${id}-error`}>
          {error}
        </p>
      )}
    </>
  );
}

/** A labelled text input with its hint and its validation message. */
export function TextField(
  props: Base & {
    readonly value: string;
    readonly onChange: (value: string) => void;
    readonly type?: 'text' | 'date' | 'datetime-local' | 'search';
    readonly placeholder?: string;
    readonly multiline?: boolean;
  },
) {
  const id = useId();
  const common = {
    id,
    name: props.name,
    value: props.value,
    autoFocus: props.autoFocus,
    placeholder: props.placeholder,
    'aria-invalid': props.error !== undefined,
    'aria-describedby': props.error !== undefined ? `${id}-error` : undefined,
  };
  return (
    <div className="field">
      <label htmlFor={id}>{props.label}</label>
      {props.multiline === true ? (
        <textarea {...common} rows={3} onChange={(event) => props.onChange(event.target.value)} />
      ) : (
        <input
          {...common}
          type={props.type ?? 'text'}
          onChange={(event) => props.onChange(event.target.value)}
        />
      )}
      <FieldMessages id={id} error={props.error} hint={props.hint} />
    </div>
  );
}

/**
 * A labelled number input that keeps what was typed (so "0." survives) and reports a number, or
 * null when blank. The unit is shown beside the box.
 */
export function NumberField(
  props: Base & {
    readonly value: string;
    readonly onChange: (text: string) => void;
    readonly unit: string;
    readonly step?: string;
    /** A warning that does not block saving (a dial above the vaporiser's mark), shown under the box. */
    readonly caution?: string | undefined;
  },
) {
  const id = useId();
  const describedBy = [
    props.error !== undefined ? `${id}-error` : undefined,
    props.caution !== undefined ? `${id}-caution` : undefined,
  ].filter((part) => part !== undefined);
  return (
    <div className="field">
      <label htmlFor={id}>
        {props.label} <span className="unit">({props.unit})</span>
      </label>
      <span className="with-unit">
        <input
          id={id}
          name={props.name}
          inputMode="decimal"
          value={props.value}
          autoFocus={props.autoFocus}
          aria-invalid={props.error !== undefined}
          aria-describedby={describedBy.length > 0 ? describedBy.join(' ') : undefined}
          onChange={(event) => props.onChange(event.target.value)}
        />
        <span aria-hidden="true">{props.unit}</span>
      </span>
      <FieldMessages id={id} error={props.error} hint={props.hint} />
      {props.caution !== undefined && (
        <p className="field-caution" id={`${id}-caution`}>
          {props.caution}
        </p>
      )}
    </div>
  );
}

/** A labelled drop-down list. */
export function SelectField<T extends string>(
  props: Base & {
    readonly value: T;
    readonly options: readonly { readonly value: T; readonly label: string }[];
    readonly onChange: (value: T) => void;
  },
) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{props.label}</label>
      <select
        id={id}
        name={props.name}
        value={props.value}
        autoFocus={props.autoFocus}
        aria-invalid={props.error !== undefined}
        onChange={(event) => props.onChange(event.target.value as T)}
      >
        {props.options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      <FieldMessages id={id} error={props.error} hint={props.hint} />
    </div>
  );
}

/** Parses what was typed in a number box: null when blank, NaN when not a number. */
export function parseNumber(text: string): number | null {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return null;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : Number.NaN;
}

/** Text for a number box. */
export function numberText(value: number | null | undefined): string {
  return value === null || value === undefined ? '' : String(value);
}

/** A set of radio buttons for a short list of choices. */
export function Choice<T extends string>(props: {
  readonly legend: string;
  readonly name: string;
  readonly options: readonly T[];
  readonly labels?: Readonly<Record<string, string>>;
  readonly value: T;
  readonly error: string | undefined;
  readonly onChange: (value: T) => void;
}) {
  const errorId = useId();
  return (
    <fieldset className="field choice" aria-describedby={props.error !== undefined ? errorId : undefined}>
      <legend>{props.legend}</legend>
      <div className="choice-options">
        {props.options.map((option) => (
          <label key={option}>
            <input
              type="radio"
              name={props.name}
              value={option}
              checked={props.value === option}
              aria-invalid={props.error !== undefined ? true : undefined}
              onChange={() => props.onChange(option)}
            />
            {props.labels?.[option] ?? option}
          </label>
        ))}
      </div>
      {props.error !== undefined && (
        <p className="field-error" id={errorId}>
          {props.error}
        </p>
      )}
    </fieldset>
  );
}
