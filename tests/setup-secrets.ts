// vitest setup file: every test file (and every process it starts) gets generated secrets.
import { provideTestSecrets } from "./integration/helpers/secrets";

provideTestSecrets();
