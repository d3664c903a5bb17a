// Topic authorisation on the embedded broker, as pure functions of the principal and topic.
//   device      publish tw/v1/dev/{its controllerId}/raw; subscribe tw/v1/dev/{its controllerId}/cmd/#
//   svc-ingest  subscribe raw and org events; publish readings, events and device commands
//   svc-web     publish commands, events and sim control; subscribe everything under tw/v1/org/
//   svc-simulator subscribe sim control
import { topics } from "../topics";
import type { Principal } from "./principals";
import { filterWithin, topicMatches } from "./topic-match";

const SERVICE_RULES = {
  ingest: {
    publish: [topics.readingWildcard, topics.eventWildcard, topics.commandAll],
    subscribe: [topics.rawWildcard, topics.eventWildcard],
  },
  web: {
    publish: [topics.commandAll, topics.eventWildcard, topics.simControlWildcard],
    subscribe: [topics.orgAll],
  },
  simulator: {
    publish: [],
    subscribe: [topics.simControlWildcard],
  },
} as const satisfies Record<string, { publish: readonly string[]; subscribe: readonly string[] }>;

type Rules = { publish: readonly string[]; subscribe: readonly string[] };

/** A device's rules, worked out once per connection: its every publish is checked against them. */
const deviceRules = new WeakMap<Principal, Rules>();

function rules(p: Principal): Rules {
  if (p.kind === "service") return SERVICE_RULES[p.account];
  let r = deviceRules.get(p);
  if (!r) {
    r = { publish: [topics.raw(p.controllerId)], subscribe: [topics.commandWildcard(p.controllerId)] };
    deviceRules.set(p, r);
  }
  return r;
}

export function canPublish(p: Principal, topic: string): boolean {
  if (topic.startsWith("$")) return false; // $SYS and friends are the broker's own
  for (const allowed of rules(p).publish) if (allowed === topic || topicMatches(allowed, topic)) return true;
  return false;
}

export function canSubscribe(p: Principal, filter: string): boolean {
  return rules(p).subscribe.some((allowed) => filterWithin(filter, allowed));
}

/** Devices must not retain raw signals: the ingest would get stale samples on every subscribe. */
export function mayRetain(p: Principal): boolean {
  return p.kind === "service";
}
