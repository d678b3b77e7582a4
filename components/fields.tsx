"use client";
import { useId } from "react";

/** Joins messages for one field, or undefined. */
export function errText(errors: Record<string, string[]>, path: string): string | undefined {
  const m = errors[path];
  return m && m.length ? m.join("; ") : undefined;
}

/**
 * Joins the messages for a whole value and its numbered entries (`key`, `key.0`, `key.1`, …),
 * or undefined.
 */
export function wholeErrors(errors: Record<string, string[]>, key: string): string | undefined {
  const re = new RegExp(`^${key.replace(/\./g, "\\.")}(\\.\\d+)?$`);
  const m = Object.entries(errors)
    .filter(([p]) => re.test(p))
    .flatMap(([, ms]) => ms);
  return m.length ? m.join("; ") : undefined;
}

interface BaseProps {
  label: string;
  error?: string;
  hint?: string;
  readOnly?: boolean;
  name?: string;
}

/** A field's label with its optional hint. */
function FieldLabel({ id, label, hint }: { id: string; label: string; hint?: string }) {
  return (
    <label htmlFor={id}>
      {label}
      {hint && <span className="hint"> ({hint})</span>}
    </label>
  );
}

/** A field's error message, referenced by the input's aria-describedby as `${id}-err`. */
function FieldErr({ id, error }: { id: string; error?: string }) {
  return error ? (
    <span id={id + "-err"} className="err">
      {error}
    </span>
  ) : null;
}

/** aria-invalid and aria-describedby of an input with an optional error. */
function errAria(id: string, error: string | undefined) {
  return { "aria-invalid": error ? true : undefined, "aria-describedby": error ? id + "-err" : undefined } as const;
}

/** Labelled text input with its error below; the typed text is kept as is. */
export function TextField(props: BaseProps & { value: string; onChange: (v: string) => void; type?: string; autoComplete?: string; required?: boolean }) {
  const id = useId();
  return (
    <div className="field">
      <FieldLabel id={id} label={props.label} hint={props.hint} />
      <input
        id={id}
        name={props.name}
        type={props.type ?? "text"}
        value={props.value}
        autoComplete={props.autoComplete}
        required={props.required}
        readOnly={props.readOnly}
        {...errAria(id, props.error)}
        onChange={(e) => props.onChange(e.target.value)}
      />
      <FieldErr id={id} error={props.error} />
    </div>
  );
}

/** Labelled number input with its unit shown beside it. Kept as text so nothing typed is lost. */
export function NumberField(props: BaseProps & { value: string; onChange: (v: string) => void; unit: string }) {
  const id = useId();
  return (
    <div className="field">
      <FieldLabel id={id} label={props.label} hint={props.hint} />
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
      <FieldErr id={id} error={props.error} />
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
  /** Shown in an empty cell (what an empty value means, e.g. "assumed"). */
  placeholder?: string;
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
        placeholder={props.placeholder}
        readOnly={props.readOnly}
        {...errAria(id, props.error)}
        onChange={(e) => props.onChange(e.target.value)}
      />
      <FieldErr id={id} error={props.error} />
    </>
  );
}

export function SelectField<T extends string>(
  props: BaseProps & { value: T; onChange: (v: T) => void; options: readonly { value: T; label: string }[] },
) {
  const id = useId();
  return (
    <div className="field">
      <FieldLabel id={id} label={props.label} hint={props.hint} />
      <select
        id={id}
        name={props.name}
        value={props.value}
        disabled={props.readOnly}
        {...errAria(id, props.error)}
        onChange={(e) => props.onChange(e.target.value as T)}
      >
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <FieldErr id={id} error={props.error} />
    </div>
  );
}

/** The description textarea of a document form. */
export function DescriptionField(props: { value: string; onChange: (v: string) => void; readOnly?: boolean }) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>Description</label>
      <textarea id={id} name="description" rows={2} style={{ fontFamily: "inherit" }} value={props.value} readOnly={props.readOnly} onChange={(e) => props.onChange(e.target.value)} />
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
