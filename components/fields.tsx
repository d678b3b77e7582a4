"use client";
import { useId } from "react";

/** Joins messages for one field, or undefined. */
export function errText(errors: Record<string, string[]>, path: string): string | undefined {
  const m = errors[path];
  return m && m.length ? m.join("; ") : undefined;
}

interface BaseProps {
  label: string;
  error?: string;
  hint?: string;
  readOnly?: boolean;
  name?: string;
}

/** Labelled text input with its error below; the typed text is kept as is. */
export function TextField(props: BaseProps & { value: string; onChange: (v: string) => void; type?: string; autoComplete?: string; required?: boolean }) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>
        {props.label}
        {props.hint && <span className="hint"> ({props.hint})</span>}
      </label>
      <input
        id={id}
        name={props.name}
        type={props.type ?? "text"}
        value={props.value}
        autoComplete={props.autoComplete}
        required={props.required}
        readOnly={props.readOnly}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? id + "-err" : undefined}
        onChange={(e) => props.onChange(e.target.value)}
      />
      {props.error && (
        <span id={id + "-err"} className="err">
          {props.error}
        </span>
      )}
    </div>
  );
}

/** Labelled number input with its unit shown beside it. Kept as text so nothing typed is lost. */
export function NumberField(props: BaseProps & { value: string; onChange: (v: string) => void; unit: string }) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>
        {props.label}
        {props.hint && <span className="hint"> ({props.hint})</span>}
      </label>
      <div className="unit-input">
        <input
          id={id}
          name={props.name}
          type="text"
          inputMode="decimal"
          value={props.value}
          readOnly={props.readOnly}
          aria-invalid={props.error ? true : undefined}
          aria-describedby={[id + "-unit", props.error ? id + "-err" : ""].filter(Boolean).join(" ")}
          onChange={(e) => props.onChange(e.target.value)}
        />
        <span className="unit" id={id + "-unit"}>
          {props.unit || "–"}
        </span>
      </div>
      {props.error && (
        <span id={id + "-err"} className="err">
          {props.error}
        </span>
      )}
    </div>
  );
}

/** A compact number input for table cells: the column header names the unit; aria-label repeats it. */
export function CellNumber(props: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  error?: string;
  readOnly?: boolean;
  className?: string;
  name?: string;
}) {
  const id = useId();
  return (
    <>
      <input
        id={id}
        name={props.name}
        type="text"
        inputMode="decimal"
        className={props.className ?? "n"}
        aria-label={props.label}
        value={props.value}
        readOnly={props.readOnly}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? id + "-err" : undefined}
        onChange={(e) => props.onChange(e.target.value)}
      />
      {props.error && (
        <span id={id + "-err"} className="err">
          {props.error}
        </span>
      )}
    </>
  );
}

export function SelectField<T extends string>(
  props: BaseProps & { value: T; onChange: (v: T) => void; options: readonly { value: T; label: string }[] },
) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>
        {props.label}
        {props.hint && <span className="hint"> ({props.hint})</span>}
      </label>
      <select
        id={id}
        name={props.name}
        value={props.value}
        disabled={props.readOnly}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? id + "-err" : undefined}
        onChange={(e) => props.onChange(e.target.value as T)}
      >
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {props.error && (
        <span id={id + "-err"} className="err">
          {props.error}
        </span>
      )}
    </div>
  );
}

/** The aria-live summary of problems; always rendered so screen readers hear changes. */
export function ErrorSummary({ title, messages }: { title?: string; messages: string[] }) {
  return (
    <div aria-live="polite" role="status" className="error-summary">
      {messages.length > 0 && (
        <div className="notice bad" data-testid="error-summary">
          <strong>{title ?? (messages.length === 1 ? "1 problem to fix" : `${messages.length} problems to fix`)}</strong>
          <ul>
            {messages.map((m, i) => (
              <li key={i}>{m}</li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}
