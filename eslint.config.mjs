import { defineConfig, globalIgnores } from "eslint/config";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

export default defineConfig([
  ...nextVitals,
  ...nextTs,
  {
    // zod is configured for the browser in one place (no eval under our Content-Security-Policy), and
    // a page should load it only with a schema it needs: schemas take `z` from there.
    files: ["app/**", "components/**", "lib/**"],
    ignores: ["lib/validation/zod.ts"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        { paths: [{ name: "zod", message: 'Import z from "@/lib/validation/zod" (or "./zod" inside lib/validation).', allowTypeImports: true }] },
      ],
    },
  },
  globalIgnores([".next/**", ".data/**", "node_modules/**", "next-env.d.ts", "drizzle/**", "test-results/**", "playwright-report/**"]),
]);
