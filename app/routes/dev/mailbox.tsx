import { Link } from "react-router";
import { requireUser } from "~/auth/auth.server";
import { isDomainError } from "~/domain/errors";
import { mailboxAvailable, mailboxFor } from "~/services/mailbox.server";
import { notFound } from "~/utils/http.server";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/mailbox";

/**
 * Local mode only: the messages the local mail capture received (invitations, review notices), so
 * links in them can be followed without a real mail server. Only to a signed-in person, and only
 * their own mail (an administrator also sees their organisation's). Absent with a real relay.
 */
export async function loader({ request, context }: Route.LoaderArgs) {
  if (!mailboxAvailable()) notFound("Page");
  const current = await requireUser({ request, context });
  const url = new URL(request.url);
  const to = url.searchParams.get("to") ?? undefined;
  try {
    const { messages, selected } = await mailboxFor(current, { to, id: url.searchParams.get("id") ?? undefined });
    return { to: to ?? "", messages, selected, admin: current.roles.includes("admin") };
  } catch (error) {
    if (isDomainError(error) && error.kind === "not-found") notFound("Page");
    throw error;
  }
}

export default function MailboxRoute({ loaderData }: Route.ComponentProps) {
  const { messages, selected } = loaderData;
  return (
    <main className="mx-auto max-w-6xl px-6 py-6">
      <div className="mb-4 rounded border border-warn/40 bg-warn-soft px-3 py-2 text-sm text-warn">
        Local mailbox: mail captured instead of being delivered, shown to its recipient{loaderData.admin ? " (and, to you as administrator, everything about your organisation, invitations included)" : ""}. It does not exist when a real mail relay is configured.
      </div>
      <h1 className="mb-3 text-xl font-semibold">Captured mail</h1>
      <form method="get" className="mb-4 flex gap-2 text-sm">
        <input name="to" defaultValue={loaderData.to} placeholder="Filter by recipient" aria-label="Recipient" className="rounded border border-line-strong bg-surface px-2 py-1" />
        <button type="submit" className="rounded border border-line-strong bg-surface px-3 py-1">
          Filter
        </button>
      </form>
      {messages.length === 0 ? (
        <p className="text-sm text-ink-muted">No mail yet.</p>
      ) : (
        <div className="grid gap-4 md:grid-cols-[20rem_1fr]">
          <ul className="divide-y divide-line rounded border border-line bg-surface text-sm">
            {messages.map((m) => (
              <li key={m.id} className={selected?.id === m.id ? "bg-accent-soft" : ""}>
                <Link to={`?${new URLSearchParams({ ...(loaderData.to ? { to: loaderData.to } : {}), id: m.id })}`} className="block px-3 py-2 text-ink no-underline">
                  <span className="block font-semibold">{m.subject}</span>
                  <span className="block text-xs text-ink-muted">
                    {m.to.join(", ")} · {formatUtc(m.receivedAt)}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
          {selected ? (
            <article className="rounded border border-line bg-surface p-4" aria-label="Message">
              <h2 className="font-semibold">{selected.subject}</h2>
              <p className="mb-3 text-xs text-ink-muted">
                From {selected.from} to {selected.to.join(", ")}
              </p>
              <pre className="whitespace-pre-wrap font-sans text-sm">{linkify(selected.text ?? "")}</pre>
            </article>
          ) : null}
        </div>
      )}
    </main>
  );
}

// Plain text only (never the message's HTML): links become anchors so they can be followed.
function linkify(text: string) {
  return text.split(/(https?:\/\/\S+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part}>
        {part}
      </a>
    ) : (
      part
    ),
  );
}

export function meta() {
  return [{ title: "Mailbox (development) · Spanwright" }];
}
