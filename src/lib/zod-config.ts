import { z } from "zod";

// Imported first by main.tsx, before any schema is built. zod 4 probes for eval with `new Function("")` when its
// first object schema is made; under Lotwise's CSP (script-src 'self', no 'unsafe-eval') the probe is refused and
// reported as a securitypolicyviolation even though zod catches it. jitless skips the probe (and the JIT, which
// the CSP forbids anyway). Seen in Chromium by tests/e2e/csp.test.ts.
z.config({ jitless: true });
