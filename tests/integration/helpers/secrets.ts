// Tests run with secrets of their own, generated per run: nothing in the source is a secret. The
// processes they spawn inherit them from process.env.
import { generateSecrets, SECRET_NAMES } from "../../../ingest/secrets";

/** Puts freshly generated secrets into process.env, keeping any already set. */
export function provideTestSecrets(): void {
  const fresh = generateSecrets();
  for (const name of SECRET_NAMES) process.env[name] ||= fresh[name];
}
