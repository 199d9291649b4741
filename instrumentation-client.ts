// Runs in the browser before the app's own code (Next.js instrumentation-client convention).
import "@/lib/security/no-eval";
