"use server";
// Confirming an acknowledge link from a mail. No session: the signed, expiring, single-use link
// is the credential, and it names the user who acknowledges.
import { redirect } from "next/navigation";
import { z } from "zod";
import { getDb } from "@/db/client";
import { acknowledgeFromLink } from "@/db/queries/incident-actions";
import { ApiError } from "@/app/_server/errors";
import { verifyAckToken } from "@/ingest/alerts/ack-link";
import { announceIncident } from "@/app/api/incidents/announce";

const tokenSchema = z.string().min(20).max(2000).regex(/^[\w-]+\.[\w-]+\.[\w-]+$/);

export async function confirmAcknowledge(rawToken: string) {
  const token = tokenSchema.safeParse(rawToken);
  if (!token.success) redirect("/ack/invalid");
  const checked = await verifyAckToken(token.data);
  if (!checked.ok) redirect(`/ack/${token.data}`);
  let outcome = "done";
  try {
    const now = Date.now();
    const incident = await acknowledgeFromLink(getDb(), checked.claims, now);
    announceIncident(incident, now);
  } catch (err) {
    if (!(err instanceof ApiError)) throw err;
    outcome = err.status === 409 ? "conflict" : "gone";
  }
  redirect(`/ack/${token.data}?outcome=${outcome}`);
}
