import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  { ignores: [".next/**", "node_modules/**", "data/**", "db/migrations/**", "next-env.d.ts", "test-results/**"] },
  // Tests have no React components: use…() there are vitest fixtures that register hooks
  // (useTestDatabase, useIncidentHarness), not React hooks.
  { files: ["tests/**/*.ts"], rules: { "react-hooks/rules-of-hooks": "off" } },
];
export default config;
