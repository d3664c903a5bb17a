import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Inbox } from "lucide-react";
import { z } from "zod";
import { eq } from "drizzle-orm";
import { currentUser } from "@/app/_server/session";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { Card, PageHeader } from "@/components/ui/card";
import { LinkedText } from "@/components/incidents/linked-text";
import { formatDateTime } from "@/lib/display/time";
import { mailOfOrganisation } from "./scope";

export const metadata: Metadata = { title: "Demo mailbox" };
export const dynamic = "force-dynamic";

const sunk = z.object({
  messages: z.array(z.object({ id: z.number(), receivedAt: z.number(), from: z.string(), to: z.array(z.string()), subject: z.string(), text: z.string() })),
});

async function readSink(): Promise<{ ok: true; messages: z.infer<typeof sunk>["messages"] } | { ok: false; error: string }> {
  const base = (process.env.MAIL_SINK_URL ?? "http://127.0.0.1:2526").replace(/\/$/, "");
  try {
    const res = await fetch(`${base}/messages`, { cache: "no-store", signal: AbortSignal.timeout(3000) });
    if (!res.ok) return { ok: false, error: `The mail sink answered ${res.status}.` };
    const parsed = sunk.safeParse(await res.json());
    return parsed.success ? { ok: true, messages: parsed.data.messages } : { ok: false, error: "The mail sink sent something unexpected." };
  } catch {
    return { ok: false, error: `The mail sink at ${base} is not running (start it with npm run mailsink, or run the whole demo).` };
  }
}

export default async function MailboxPage() {
  const user = (await currentUser())!;
  if (user.role !== "owner" || process.env.TIDEWELL_DEMO !== "1") notFound();
  const read = await readSink();
  const orgEmails = (await getDb().select({ email: users.email }).from(users).where(eq(users.orgId, user.orgId))).map((u) => u.email);
  const sink = read.ok ? { ok: true as const, messages: mailOfOrganisation(read.messages, orgEmails) } : read;
  return (
    <>
      <PageHeader title="Demo mailbox" subtitle="Every mail Tidewell sent to your organisation in this demo, newest first, as the local mail sink received it" />
      {!sink.ok ? (
        <Card className="p-6 text-sm" role="alert">
          {sink.error}
        </Card>
      ) : sink.messages.length === 0 ? (
        <Card className="flex items-center gap-3 p-6 text-sm text-ink-soft">
          <Inbox className="size-5" aria-hidden /> No mail yet. Alerts, escalations and the morning digest appear here.
        </Card>
      ) : (
        <ul className="space-y-4">
          {sink.messages.map((m) => (
            <li key={m.id}>
              <Card className="p-0" data-mail={m.id}>
                <details>
                  <summary className="flex cursor-pointer list-none flex-wrap items-baseline justify-between gap-2 p-4 hover:bg-paper">
                    <span className="font-semibold">{m.subject || "(no subject)"}</span>
                    <span className="num text-xs text-ink-soft">
                      to {m.to.join(", ")} · {formatDateTime(m.receivedAt)}
                    </span>
                  </summary>
                  <div className="border-t border-paper-line p-4">
                    <LinkedText text={m.text} />
                  </div>
                </details>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
