import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentUser } from "@/app/_server/session";
import { NotBuiltYet, PageHeader } from "@/components/ui/card";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const user = (await currentUser())!;
  if (user.role === "night_manager") redirect("/");
  return (
    <>
      <PageHeader title="Settings" subtitle="Organisation, users, sites, tanks, probes, devices and targets" />
      <NotBuiltYet what="Editing users, sites, tanks, probes and devices" />
    </>
  );
}
