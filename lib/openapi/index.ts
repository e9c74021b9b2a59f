import { buildOpenApiDocument, type Operation } from "./registry";
import { coreOperations } from "./operations/core";
import { designOperations } from "./operations/design";

/** Every documented operation; each area adds its own list here. */
export const OPERATIONS: readonly Operation[] = [...coreOperations, ...designOperations];

export function openApiDocument() {
  return buildOpenApiDocument(OPERATIONS, { version: "1" });
}
