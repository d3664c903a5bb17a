import { redirect } from "next/navigation";
import { LogOut } from "lucide-react";
import { currentUser, ROLE_LABEL } from "@/app/_server/session";
import { Logo } from "@/components/logo";
import { BottomNav, SideNav } from "@/components/shell/nav";
import { OfflineBanner } from "@/components/pwa/offline-banner";
import { navFor } from "@/components/shell/nav-items";
import { signOutAction } from "./actions";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  const items = navFor(user.role, process.env.TIDEWELL_DEMO === "1");
  return (
    <div className="min-h-dvh lg:grid lg:grid-cols-[15rem_1fr]">
      <aside data-shell="side" className="sticky top-0 hidden h-dvh flex-col border-r border-paper-line bg-paper-raised p-4 lg:flex">
        <div className="mb-6 px-2">
          <Logo />
        </div>
        <SideNav items={items} />
        <div className="mt-auto border-t border-paper-line pt-4">
          <p className="truncate px-2 text-sm font-medium">{user.name}</p>
          <p className="px-2 text-xs text-ink-soft" data-testid="role">
            {ROLE_LABEL[user.role]}
          </p>
          <form action={signOutAction} className="mt-3">
            <button className="flex h-10 w-full items-center gap-2 rounded-md px-2 text-sm text-ink-soft hover:bg-paper-sunk hover:text-ink">
              <LogOut className="size-4" aria-hidden /> Sign out
            </button>
          </form>
        </div>
      </aside>
      <div className="min-w-0">
        <header data-shell="top" className="sticky top-0 z-20 flex h-14 items-center justify-between border-b border-paper-line bg-paper-raised/95 px-4 backdrop-blur lg:hidden">
          <Logo />
          <form action={signOutAction} className="flex items-center gap-3">
            <span className="text-xs text-ink-soft">{ROLE_LABEL[user.role]}</span>
            <button aria-label="Sign out" className="flex size-10 items-center justify-center rounded-md text-ink-soft hover:bg-paper-sunk">
              <LogOut className="size-5" aria-hidden />
            </button>
          </form>
        </header>
        <OfflineBanner />
        <main className="mx-auto max-w-[1800px] p-4 pb-24 lg:p-8">{children}</main>
      </div>
      <BottomNav items={items} />
    </div>
  );
}
