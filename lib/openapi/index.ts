import { buildOpenApiDocument, type Operation } from "./registry";
import { coreOperations } from "./operations/core";
import { designOperations } from "./operations/design";
import { fieldOperations } from "./operations/field";
import { fileOperations } from "./operations/files";
import { peopleOperations } from "./operations/people";

/** Every documented operation; each area adds its own list here. */
export const OPERATIONS: readonly Operation[] = [
  ...coreOperations,
  ...designOperations,
  ...fieldOperations,
  ...peopleOperations,
  ...fileOperations,
];

export function openApiDocument() {
  return buildOpenApiDocument(OPERATIONS, { version: "1" });
}
