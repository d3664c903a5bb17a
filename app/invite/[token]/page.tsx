import type { Metadata } from "next";
import Link from "next/link";
import { CircleAlert } from "lucide-react";
import { getDb } from "@/db/client";
import { readInvitation } from "@/db/queries/settings-invitations";
import { ApiError } from "@/app/_server/errors";
import { Logo } from "@/components/logo";
import { AcceptInvitationForm } from "@/components/settings/accept-invitation-form";
import { ROLE_NAMES } from "@/lib/settings/enums";

export const metadata: Metadata = { title: "Accept invitation" };
export const dynamic = "force-dynamic";

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let invitation: Awaited<ReturnType<typeof readInvitation>> | null = null;
  let problem: string | null = null;
  try {
    invitation = await readInvitation(getDb(), token);
  } catch (err) {
    if (!(err instanceof ApiError)) throw err;
    problem = err.message;
  }
  return (
    <main className="flex min-h-dvh items-center justify-center p-6">
      <div className="w-full max-w-sm">
        <div className="mb-8">
          <Logo />
        </div>
        {invitation ? (
          <>
            <h1 className="text-2xl font-semibold">Welcome, {invitation.user.name}</h1>
            <p className="mb-6 mt-1 text-sm text-ink-soft">
              You are invited to {invitation.orgName} as {ROLE_NAMES[invitation.user.role].toLowerCase()}. Choose a password for{" "}
              <span className="font-medium text-ink">{invitation.user.email}</span>.
            </p>
            <AcceptInvitationForm token={token} email={invitation.user.email} />
          </>
        ) : (
          <>
            <h1 className="text-2xl font-semibold">Invitation</h1>
            <p role="alert" className="mt-4 flex items-start gap-2 rounded-md border border-bad/30 bg-bad/5 px-3 py-2 text-sm text-bad">
              <CircleAlert className="mt-0.5 size-4 shrink-0" aria-hidden />
              {problem}
            </p>
            <Link href="/sign-in" className="mt-6 inline-block text-sm font-medium text-accent-700 hover:underline">
              Go to sign-in
            </Link>
          </>
        )}
      </div>
    </main>
  );
}
