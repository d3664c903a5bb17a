// Who is on shift at a site: the day shift runs [dayStartHour, nightStartHour) in the site's
// time zone, the night shift the rest of the day.
import type { Role } from "../../db/schema";

export interface ShiftSite {
  timeZone: string;
  dayStartHour: number;
  nightStartHour: number;
  dayRole: Role;
  nightRole: Role;
}

export function localParts(at: number, timeZone: string): { date: string; hour: number } {
  const parts = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", hourCycle: "h23" }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? "";
  return { date: `${get("year")}-${get("month")}-${get("day")}`, hour: Number(get("hour")) };
}

export function isDayShift(site: ShiftSite, at: number): boolean {
  const { hour } = localParts(at, site.timeZone);
  const { dayStartHour: d, nightStartHour: n } = site;
  return d <= n ? hour >= d && hour < n : hour >= d || hour < n;
}

export function onShift(site: ShiftSite, at: number): { shift: "day" | "night"; role: Role } {
  return isDayShift(site, at) ? { shift: "day", role: site.dayRole } : { shift: "night", role: site.nightRole };
}
