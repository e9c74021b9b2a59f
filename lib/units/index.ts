export { ENGINE_UNITS, UNITS, UnitError, convert, fromSi, toSi, type Quantity, type UnitId } from "./convert";
export { DISPLAY_UNITS, displayUnit, formatQuantity, fromDisplay, toDisplay, unitSystemFor, type DisplayUnit, type UnitSystem } from "./display";
