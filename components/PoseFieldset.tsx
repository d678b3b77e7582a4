"use client";
import { NumberField } from "./fields";
import { POSE_KEYS, type PoseText } from "./pose";

const LABEL: Record<keyof PoseText, string> = { x: "x", y: "y", z: "z", roll: "roll", pitch: "pitch", yaw: "yaw" };

/**
 * Six labelled inputs for a pose: x y z in mm and roll pitch yaw in degrees. `errors` holds
 * messages by pose key; `errorAll` a message for the transform as a whole.
 */
export function PoseFieldset(props: {
  legend: string;
  description?: React.ReactNode;
  value: PoseText;
  onChange: (v: PoseText) => void;
  errors?: Partial<Record<keyof PoseText, string>>;
  errorAll?: string;
  readOnly?: boolean;
  idPrefix?: string;
}) {
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
            error={props.errors?.[k]}
            onChange={(v) => props.onChange({ ...props.value, [k]: v })}
          />
        ))}
      </div>
      {props.errorAll && <p className="err">{props.errorAll}</p>}
    </fieldset>
  );
}
