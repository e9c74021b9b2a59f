/** The airflow engine's public API: pure functions, SI units inside. */
export * from "./constants";
export * from "./air";
export * from "./velocity";
export * from "./network";
export * from "./balancing";
export * from "./layout";
export * from "./integrate";
export * from "./quality";
export * from "./uncertainty";
export * from "./traverse";
export { runCalcCommand, CALC_COMMANDS, type CalcCommand } from "./commands";
export * from "./errors";
