import { z } from "zod";

// zod compiles a fast parser with `new Function` when it may. Under the Content-Security-Policy
// (no 'unsafe-eval') the browser refuses that and reports a violation, even though zod then falls
// back. Turning the compiler off keeps the policy quiet; parsing stays correct, a little slower.
z.config({ jitless: true });
