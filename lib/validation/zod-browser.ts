import { z } from "zod";

// Our Content-Security-Policy forbids eval. In the browser, zod would probe `new Function` to compile
// faster parsers; the probe is caught, but the browser still reports it as a policy violation.
// Servers keep the compiled parsers (no CSP applies there, and the calc API is on a hot path).
if (typeof window !== "undefined") z.config({ jitless: true });
