/**
 * Input the engine cannot work with, explained per field. `fields` maps dotted snake_case API paths
 * (`air.wet_bulb_c`, `nodes.3.parent`) to a message naming the value and what is allowed.
 */
export class EngineInputError extends Error {
  readonly fields: Record<string, string>;
  constructor(message: string, fields: Record<string, string>) {
    super(message);
    this.name = new.target.name;
    this.fields = fields;
  }
}

/** At most this many field errors are returned; the rest are counted (a huge bad input must not make a huge answer). */
export const MAX_FIELD_ERRORS = 50;

/** Key under which the count of field errors left out is reported. */
export const MORE_FIELDS_KEY = "(more)";

/** The first MAX_FIELD_ERRORS field errors, plus a "(more)" entry counting the rest when there are more. */
export function capFieldErrors(fields: Record<string, string>, totalCount?: number): Record<string, string> {
  const keys = Object.keys(fields);
  const total = Math.max(totalCount ?? keys.length, keys.length);
  if (total <= MAX_FIELD_ERRORS) return fields;
  const capped: Record<string, string> = {};
  for (const key of keys.slice(0, MAX_FIELD_ERRORS)) capped[key] = fields[key] as string;
  capped[MORE_FIELDS_KEY] = `${(total - MAX_FIELD_ERRORS).toLocaleString("en-US")} more fields have problems (only the first ${MAX_FIELD_ERRORS} are listed); fix these and send again`;
  return capped;
}
