// The demo's secrets: generated on its first start into a git-ignored file readable by its owner
// only (mode 0600), and reused after, so sessions and device links survive a restart. A value
// already in the environment wins over the file.
import fs from "node:fs";
import path from "node:path";
import { z } from "zod";
import { generateSecrets, SECRET_NAMES, SECRET_VARIABLES, type SecretName } from "../ingest/secrets";

const secretsFile = z.object(
  Object.fromEntries(SECRET_NAMES.map((n) => [n, z.string().min(SECRET_VARIABLES[n].minLength)])) as Record<SecretName, z.ZodString>,
);

export function loadOrCreateDemoSecrets(file: string): { secrets: Record<SecretName, string>; created: boolean } {
  if (!fs.existsSync(file)) {
    const secrets = generateSecrets();
    fs.mkdirSync(path.dirname(file), { recursive: true });
    // "wx": never overwrite a file another start wrote in the meantime.
    fs.writeFileSync(file, `${JSON.stringify(secrets, null, 2)}\n`, { mode: 0o600, flag: "wx" });
    return { secrets, created: true };
  }
  if ((fs.statSync(file).mode & 0o077) !== 0) fs.chmodSync(file, 0o600);
  let parsed: unknown;
  try {
    parsed = JSON.parse(fs.readFileSync(file, "utf8"));
  } catch {
    parsed = null;
  }
  const result = secretsFile.safeParse(parsed);
  if (!result.success) {
    throw new Error(`${file} is not a valid secrets file (${SECRET_NAMES.join(", ")}); delete it and start the demo again to generate new secrets (everyone will have to sign in again).`);
  }
  return { secrets: result.data, created: false };
}
