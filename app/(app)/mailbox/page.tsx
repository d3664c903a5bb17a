import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { currentUser } from "@/app/_server/session";
import { NotBuiltYet, PageHeader } from "@/components/ui/card";

export const metadata: Metadata = { title: "Demo mailbox" };

export default async function MailboxPage() {
  const user = (await currentUser())!;
  if (user.role !== "owner" || process.env.TIDEWELL_DEMO !== "1") notFound();
  return (
    <>
      <PageHeader title="Demo mailbox" subtitle="What the local mail sink received" />
      <NotBuiltYet what="Reading the mail sink" />
    </>
  );
}
