import { Link } from "react-router";
import { capturedMail } from "~/services/mail.server";
import { mailCaptureEnabled } from "~/utils/env.server";
import { notFound } from "~/utils/http.server";
import { formatUtc } from "~/utils/format";
import type { Route } from "./+types/mailbox";

/**
 * Development only: the messages the local mail capture received (invitations, review notices),
 * so links in them can be followed without a real mail server. Absent whenever a real relay is set.
 */
export async function loader({ request }: Route.LoaderArgs) {
  if (!mailCaptureEnabled()) notFound("Page");
  const url = new URL(request.url);
  const to = url.searchParams.get("to") ?? undefined;
  const messages = await capturedMail({ to });
  const selectedId = url.searchParams.get("id") ?? messages[0]?.id;
  return { to: to ?? "", messages: messages.slice(0, 200), selected: messages.find((m) => m.id === selectedId) ?? null };
}

export default function MailboxRoute({ loaderData }: Route.ComponentProps) {
  const { messages, selected } = loaderData;
  return (
    <main className="mx-auto max-w-6xl px-6 py-6">
      <div className="mb-4 rounded border border-warn/40 bg-warn-soft px-3 py-2 text-sm text-warn">
        Development mailbox: mail captured locally instead of being delivered. It does not exist when a real mail relay is configured.
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
