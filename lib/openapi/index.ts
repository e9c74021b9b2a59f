import { buildOpenApiDocument, type Operation } from "./registry";
import { coreOperations } from "./operations/core";
import { designOperations } from "./operations/design";
import { deviationOperations } from "./operations/deviations";
import { fieldOperations } from "./operations/field";
import { fileOperations } from "./operations/files";
import { peopleOperations } from "./operations/people";
import { terminalOperations } from "./operations/terminals";
import { reviewOperations } from "./operations/review";
import { traverseOperations } from "./operations/traverses";

/** Every documented operation; each area adds its own list here. */
export const OPERATIONS: readonly Operation[] = [
  ...coreOperations,
  ...designOperations,
  ...fieldOperations,
  ...traverseOperations,
  ...terminalOperations,
  ...deviationOperations,
  ...peopleOperations,
  ...fileOperations,
  ...reviewOperations,
];

export function openApiDocument() {
  return buildOpenApiDocument(OPERATIONS, { version: "1" });
}
