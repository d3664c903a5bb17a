import { cn } from "./cn";

export function Card({ className, ...props }: React.HTMLAttributes<HTMLDivElement>) {
  return <div className={cn("rounded-lg border border-paper-line bg-paper-raised", className)} {...props} />;
}

export function PageHeader({ title, subtitle, actions }: { title: string; subtitle?: React.ReactNode; actions?: React.ReactNode }) {
  return (
    <div className="mb-5 flex flex-wrap items-end justify-between gap-3">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {subtitle ? <p className="mt-1 text-sm text-ink-soft">{subtitle}</p> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </div>
  );
}

export function NotBuiltYet({ what }: { what: string }) {
  return (
    <Card className="border-dashed p-8 text-center">
      <p className="font-medium">Not built yet</p>
      <p className="mt-1 text-sm text-ink-soft">{what} is planned and not available in this version.</p>
    </Card>
  );
}
