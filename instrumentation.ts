// Runs once when the server starts (Next.js instrumentation convention): a setting that would
// only fail later, on some request, stops the server now with a message saying which and why.
export async function register(): Promise<void> {
  // `next build` loads this too; the settings that matter are the ones the server starts with.
  if (
    process.env.NEXT_RUNTIME === "nodejs" &&
    process.env.NEXT_PHASE !== "phase-production-build"
  ) {
    const { exitOnStartupProblems } = await import("./lib/env");
    exitOnStartupProblems();
  }
}
