/**
 * The one error type of URDF reading: `element` names the part of the file at fault, e.g.
 * `joint "elbow" <limit> lower` or `file`, and the message says the value and the reason. The
 * command line prints it as one line; the API returns it as a 400 field error on the file.
 */
export class UrdfError extends Error {
  constructor(
    readonly element: string,
    readonly reason: string,
  ) {
    super(`${element}: ${reason}`);
    this.name = "UrdfError";
  }
}

/** A value quoted for a message, cut to 40 characters. */
export function quote(value: string): string {
  const v = value.length > 40 ? `${value.slice(0, 40)}…` : value;
  return JSON.stringify(v);
}
