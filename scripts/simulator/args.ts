// Command line of the simulator (flags win over environment variables).
//   --rate HZ           samples per second per tank (default 1; env SIM_RATE)
//   --tanks N           simulate N tanks: the seeded ones, duplicated virtually for load (env SIM_TANKS)
//   --duration S        stop after S seconds and print the count of published samples (env SIM_DURATION)
//   --fault TANK:CAUSE[:MEASURE]   start with a fault; TANK is a controller id, a tank id or the
//                       start of a tank name ("L1"); repeatable
//   --credentials FILE  device credentials written by the seed (env SIM_CREDENTIALS_FILE,
//                       default data/device-credentials.json)
import path from "node:path";
import { parseArgs } from "node:util";
import { z } from "zod";
import { SIM_FAULTS } from "../../ingest/payloads";

const faultParts = z.object({ tank: z.string().min(1), cause: z.enum(SIM_FAULTS), measure: z.enum(["ph", "ec", "temp"]).optional() });
const faultSpec = z
  .string()
  .regex(/^[^:]+:[a-z-]+(:[a-z]+)?$/, "expected TANK:CAUSE or TANK:CAUSE:MEASURE")
  .transform((s) => {
    const [tank, cause, measure] = s.split(":");
    return faultParts.parse({ tank, cause, measure });
  });
export type FaultSpec = z.infer<typeof faultSpec>;

const schema = z.object({
  rate: z.coerce.number().positive().max(1000).default(1),
  tanks: z.coerce.number().int().positive().optional(),
  duration: z.coerce.number().positive().optional(),
  fault: z.array(faultSpec).default([]),
  credentials: z.string().default(path.join(process.cwd(), "data", "device-credentials.json")),
});
export type SimArgs = z.infer<typeof schema>;

export function parseSimArgs(argv: string[], env: NodeJS.ProcessEnv = process.env): SimArgs {
  const { values } = parseArgs({
    args: argv,
    options: {
      rate: { type: "string" },
      tanks: { type: "string" },
      duration: { type: "string" },
      fault: { type: "string", multiple: true },
      credentials: { type: "string" },
    },
    strict: true,
  });
  return schema.parse({
    rate: values.rate ?? env.SIM_RATE,
    tanks: values.tanks ?? env.SIM_TANKS,
    duration: values.duration ?? env.SIM_DURATION,
    fault: values.fault,
    credentials: values.credentials ?? env.SIM_CREDENTIALS_FILE,
  });
}
