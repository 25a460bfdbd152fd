import { createHash } from "node:crypto";
import { data, useLoaderData, type LoaderFunctionArgs } from "react-router";
import { pool } from "../db.server";

/**
 * What an ordinary page of the framework does for a signed-in case view: five PostgreSQL reads
 * (the session with its person, the case with its programme, the step states, the signatures, the
 * last 20 history entries), then a table and a 20-row history. Same database, same rows as the
 * app's case overview.
 */
export async function loader({ request, params }: LoaderFunctionArgs) {
  const raw = /(?:^|;\s*)sw_session=([^;]+)/.exec(request.headers.get("Cookie") ?? "")?.[1];
  // React Router's cookie encoding (base64 of the JSON string), without a signature.
  const token = raw ? (JSON.parse(decodeURIComponent(escape(atob(decodeURIComponent(raw))))) as string) : "";
  const session = await pool.query(
    `select s.id, u.name, u.email, o.id as organisation_id, o.name as organisation, m.roles
       from sessions s join users u on u.id = s.user_id join organisations o on o.id = s.organisation_id
       join memberships m on m.user_id = s.user_id and m.organisation_id = s.organisation_id
      where s.token_hash = $1 and s.expires_at > now() limit 1`,
    [createHash("sha256").update(token).digest("hex")],
  );
  const who = session.rows[0];
  if (!who) throw data("Sign in first", { status: 401 });
  const found = await pool.query(
    `select c.id, c.reference, c.title, c.status, c.description, c.created_at, c.updated_at, p.code, p.name as programme, p.aircraft
       from cases c join programmes p on p.id = c.programme_id where c.id = $1 and c.organisation_id = $2`,
    [params.caseId, who.organisation_id],
  );
  const c = found.rows[0];
  if (!c) throw data("Not found", { status: 404 });
  const [steps, signatures, history] = await Promise.all([
    pool.query(`select s.step, s.revision, s.status, s.updated_at, u.name from case_steps s left join users u on u.id = s.updated_by where s.case_id = $1`, [c.id]),
    pool.query(`select step, signer_name, meaning, signed_at from signatures where case_id = $1 and report_id is null order by signed_at desc`, [c.id]),
    pool.query(
      `select a.id, a.at, a.action, a.actor_email, u.name from audit_log a left join users u on u.id = a.actor_id
        where a.entity_type = 'case' and a.entity_id = $1 order by a.id desc limit 20`,
      [c.id],
    ),
  ]);
  return {
    user: { name: who.name as string, organisation: who.organisation as string },
    case: { id: c.id as string, reference: c.reference as string, title: c.title as string, status: c.status as string, programme: `${c.code} — ${c.programme}`, aircraft: c.aircraft as string },
    steps: steps.rows.map((s) => ({
      step: s.step as string,
      revision: s.revision as number,
      status: s.status as string,
      by: (s.name as string | null) ?? "—",
      at: (s.updated_at as Date).toISOString(),
      signed: signatures.rows.find((g) => g.step === s.step)?.signer_name as string | undefined,
    })),
    history: history.rows.map((h) => ({ id: String(h.id), at: (h.at as Date).toISOString(), action: h.action as string, who: (h.name as string | null) ?? (h.actor_email as string) })),
  };
}

export default function CasePage() {
  const { case: c, steps, history, user } = useLoaderData<typeof loader>();
  return (
    <main>
      <p>
        {user.name} · {user.organisation}
      </p>
      <h1>
        {c.reference} — {c.title}
      </h1>
      <p>
        {c.programme}, {c.aircraft} · {c.status}
      </p>
      <table>
        <thead>
          <tr>
            <th>Step</th>
            <th>Status</th>
            <th>Revision</th>
            <th>Last changed by</th>
            <th>When</th>
            <th>Signed by</th>
          </tr>
        </thead>
        <tbody>
          {steps.map((s) => (
            <tr key={s.step}>
              <td>{s.step}</td>
              <td>{s.status}</td>
              <td>{s.revision}</td>
              <td>{s.by}</td>
              <td>{s.at.slice(0, 16).replace("T", " ")}</td>
              <td>{s.signed ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <h2>History</h2>
      <ol>
        {history.map((h) => (
          <li key={h.id}>
            {h.at.slice(0, 16).replace("T", " ")} {h.action} — {h.who}
          </li>
        ))}
      </ol>
    </main>
  );
}
