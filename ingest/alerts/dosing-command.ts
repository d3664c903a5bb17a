// The retained dosing command for a tank's controller: inhibit while a hold is on, resume after.
// Retained with QoS 1 so a controller that reconnects learns the current state at once.
import { topics } from "../topics";
import { dosingCommand, type DosingCommand } from "../payloads";
import type { PublishOptions } from "./publish";

export const DOSING_PUBLISH: PublishOptions = { qos: 1, retain: true };

interface HoldForCommand {
  id: number;
  reason: string;
  plannedEndAt: number;
}

export function inhibitMessage(controllerId: string, hold: HoldForCommand, at: number) {
  const payload: DosingCommand = dosingCommand.parse({ v: 1, inhibit: true, holdId: hold.id, until: hold.plannedEndAt, reason: hold.reason, at });
  return { topic: topics.dosingCommand(controllerId), payload: JSON.stringify(payload) };
}

export function resumeMessage(controllerId: string, hold: { id: number }, at: number) {
  const payload: DosingCommand = dosingCommand.parse({ v: 1, inhibit: false, holdId: hold.id, until: null, reason: null, at });
  return { topic: topics.dosingCommand(controllerId), payload: JSON.stringify(payload) };
}
