// Runs once when the web server starts (not at build time): the server refuses to start without
// its secrets, rather than fail on the first sign-in or, worse, sign with a guessable key.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NEXT_PHASE === "phase-production-build") return;
  const { exitUnlessSecretsSet } = await import("./ingest/secrets");
  exitUnlessSecretsSet("web", ["AUTH_SECRET", "MQTT_WEB_PASSWORD"]);
}
