/**
 * zod as Airtally's schemas use it: every schema module takes `z` from here, never from "zod" itself
 * (lint enforces it), so this runs before any schema is built, in whichever chunk first needs zod.
 *
 * Our Content-Security-Policy forbids eval. In the browser, zod would probe `new Function` to compile
 * faster parsers; the probe is caught, but the browser still reports it as a policy violation.
 * Servers keep the compiled parsers (no CSP applies there, and the calc API is on a hot path).
 */
import { z } from "zod";

if (typeof window !== "undefined") z.config({ jitless: true });

export { z };
