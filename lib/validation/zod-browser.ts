/**
 * zod as the browser must run it. Our Content-Security-Policy forbids eval. In the browser, zod would
 * probe `new Function` to compile faster parsers; the probe is caught, but the browser still reports
 * it as a policy violation. Servers keep the compiled parsers (no CSP applies there, and the calc API
 * is on a hot path).
 *
 * Every module that builds schemas imports this first (`import "./zod-browser"` before zod itself;
 * tests/validation/zod-browser.test.ts checks it), so the setting is made before any schema is built,
 * in whichever chunk a page first loads zod with, and a page that needs no schema loads no zod.
 */
import { z } from "zod";

if (typeof window !== "undefined") z.config({ jitless: true });
