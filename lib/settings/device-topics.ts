// The topics a controller uses, as shown beside its credentials (the scheme is ingest/topics.ts).
import { topics } from "../../ingest/topics";

export function topicsForController(controllerId: string) {
  return { raw: topics.raw(controllerId), commands: topics.commandWildcard(controllerId) };
}
