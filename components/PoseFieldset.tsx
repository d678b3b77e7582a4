"use client";
import { NumberField, errText, wholeErrors } from "./fields";
import { POSE_KEYS, type PoseText } from "./pose";

const LABEL: Record<keyof PoseText, string> = { x: "x", y: "y", z: "z", roll: "roll", pitch: "pitch", yaw: "yaw" };

/** The field errors of the pose at `key` ("base", "tool.tcp"), by pose key. */
function poseErrors(errors: Record<string, string[]>, key: string): Partial<Record<keyof PoseText, string>> {
  const out: Partial<Record<keyof PoseText, string>> = {};
  for (const k of POSE_KEYS) {
    const m = errText(errors, `${key}.${k}`);
    if (m) out[k] = m;
  }
  return out;
}

/**
 * Six labelled inputs for a pose: x y z in mm and roll pitch yaw in degrees. `errors` holds
 * messages by pose key; `errorAll` a message for the transform as a whole. Or `errorMap`: the
 * form's errors by path, from which both are taken at `idPrefix`.
 */
export function PoseFieldset(props: {
  legend: string;
  description?: React.ReactNode;
  value: PoseText;
  onChange: (v: PoseText) => void;
  errors?: Partial<Record<keyof PoseText, string>>;
  errorAll?: string;
  errorMap?: Record<string, string[]>;
  readOnly?: boolean;
  idPrefix?: string;
}) {
  const fromMap = props.errorMap && props.idPrefix !== undefined;
  const errors = fromMap ? poseErrors(props.errorMap!, props.idPrefix!) : props.errors;
  const errorAll = fromMap ? wholeErrors(props.errorMap!, props.idPrefix!) : props.errorAll;
  return (
    <fieldset className="panel" data-testid={props.idPrefix}>
      <legend>{props.legend}</legend>
      {props.description && <p className="hint">{props.description}</p>}
      <div className="pose-grid">
        {POSE_KEYS.map((k) => (
          <NumberField
            key={k}
            label={LABEL[k]}
            name={props.idPrefix ? `${props.idPrefix}.${k}` : undefined}
            unit={k === "x" || k === "y" || k === "z" ? "mm" : "°"}
            value={props.value[k]}
            readOnly={props.readOnly}
            error={errors?.[k]}
            onChange={(v) => props.onChange({ ...props.value, [k]: v })}
          />
        ))}
      </div>
      {errorAll && <p className="err">{errorAll}</p>}
    </fieldset>
  );
}
