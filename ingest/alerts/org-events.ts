// Organisation events for the live web (incidents and holds), on `topics.event(orgId)`.
import { topics } from "../topics";
import { orgEvent, type OrgEvent } from "../payloads";
import type { PublishOptions } from "./publish";

export const EVENT_PUBLISH: PublishOptions = { qos: 1, retain: false };

export function orgEventMessage(e: Omit<OrgEvent, "v">) {
  const payload = orgEvent.parse({ v: 1, ...e, summary: e.summary.slice(0, 500) });
  return { topic: topics.event(e.orgId), payload: JSON.stringify(payload) };
}
