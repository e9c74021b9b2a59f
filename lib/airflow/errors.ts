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
