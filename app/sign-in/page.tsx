import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentUser } from "@/app/_server/session";
import { Logo } from "@/components/logo";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

const DEMO_ACCOUNTS = [
  ["Owner", "owner@larkspur.example"],
  ["Grower", "grower@larkspur.example"],
  ["Night manager", "night@larkspur.example"],
] as const;

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string; email?: string }> }) {
  if (await currentUser()) redirect("/");
  const { next, email } = await searchParams;
  const demo = process.env.TIDEWELL_DEMO === "1";
  return (
    <main className="grid min-h-dvh lg:grid-cols-[1.1fr_1fr]">
      <section className="relative hidden overflow-hidden bg-accent-800 p-12 text-white lg:flex lg:flex-col lg:justify-between">
        <Logo inverted />
        <div className="max-w-md">
          <p className="text-3xl font-semibold leading-tight">Every tank, every probe, every calibration — one calm screen.</p>
          <p className="mt-4 text-accent-100">
            Live pH, EC and solution temperature corrected with the calibration in force, holds that keep dosing off
            buffer readings, and alerts that page the person on shift.
          </p>
        </div>
        <p className="text-sm text-accent-200">Alerts are an aid, not a substitute for walking the tanks.</p>
        <svg aria-hidden className="absolute -right-24 bottom-16 w-[520px] opacity-15" viewBox="0 0 400 120" fill="none">
          <path d="M0 60 Q50 20 100 60 T200 60 T300 60 T400 60" stroke="white" strokeWidth="6" />
          <path d="M0 95 Q50 55 100 95 T200 95 T300 95 T400 95" stroke="white" strokeWidth="4" />
        </svg>
      </section>
      <section className="flex items-center justify-center p-6">
        <div className="w-full max-w-sm">
          <div className="mb-8 lg:hidden">
            <Logo />
          </div>
          <h1 className="text-2xl font-semibold">Sign in</h1>
          <p className="mb-6 mt-1 text-sm text-ink-soft">Use the account your farm&apos;s owner set up for you.</p>
          <SignInForm next={next} email={email} />
          {demo ? (
            <div className="mt-8 rounded-md border border-paper-line bg-paper-raised p-4 text-sm">
              <p className="font-medium">Demo accounts</p>
              <p className="text-ink-soft">
                Password for each: <code className="font-mono">tidewell-demo</code>
              </p>
              <ul className="mt-2 space-y-1">
                {DEMO_ACCOUNTS.map(([role, email]) => (
                  <li key={email} className="flex justify-between gap-3">
                    <span className="text-ink-soft">{role}</span>
                    <code className="font-mono">{email}</code>
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
        </div>
      </section>
    </main>
  );
}
