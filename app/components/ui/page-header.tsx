import type { ReactNode } from "react";

export function PageHeader({ title, description, actions }: { title: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-line pb-3">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {description ? <p className="mt-1 max-w-3xl text-sm text-ink-muted">{description}</p> : null}
      </div>
      {actions ? <div className="flex gap-2">{actions}</div> : null}
    </header>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded border border-dashed border-line-strong bg-surface px-6 py-8 text-center">
      <p className="font-semibold">{title}</p>
      {children ? <div className="mt-1 text-sm text-ink-muted">{children}</div> : null}
    </div>
  );
}

export function Panel({ title, children, className = "" }: { title?: string; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded border border-line bg-surface ${className}`}>
      {title ? <h2 className="border-b border-line px-4 py-2 text-sm font-semibold uppercase tracking-wide text-ink-muted">{title}</h2> : null}
      <div className="p-4">{children}</div>
    </section>
  );
}

export function Alert({ tone = "danger", children }: { tone?: "danger" | "warn" | "info"; children: ReactNode }) {
  const cls = tone === "danger" ? "border-danger/40 bg-danger-soft text-danger" : tone === "warn" ? "border-warn/40 bg-warn-soft text-warn" : "border-accent/30 bg-accent-soft text-accent-strong";
  return (
    <div role={tone === "info" ? "status" : "alert"} className={`rounded border px-3 py-2 text-sm ${cls}`}>
      {children}
    </div>
  );
}
