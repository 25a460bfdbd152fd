import { Form, NavLink, Outlet, useRouteLoaderData } from "react-router";
import { requireUser } from "~/auth/auth.server";
import { hasPermission, ROLE_LABELS, type Permission } from "~/domain/permissions";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/app-layout";

const NAV: { to: string; label: string; needs: Permission }[] = [
  { to: "/cases", label: "Cases", needs: "case:read" },
  { to: "/programmes", label: "Programmes", needs: "programme:read" },
  { to: "/checks", label: "Checks", needs: "step:check" },
  { to: "/reports", label: "Reports", needs: "report:read" },
  { to: "/audit", label: "Audit trail", needs: "audit:read" },
  { to: "/admin", label: "Members", needs: "org:admin" },
];

/** Every signed-in page sits in this layout; each child loader still checks its own permission. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const current = await requireUser({ request, context });
  return {
    user: current.user,
    organisation: current.organisation,
    roles: current.roles,
    nav: NAV.filter((n) => hasPermission(current.roles, n.needs)).map(({ to, label }) => ({ to, label })),
  };
}

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  return (
    <Shell data={loaderData}>
      <Outlet />
    </Shell>
  );
}

function Shell({ data, children }: { data: Route.ComponentProps["loaderData"]; children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="flex h-12 items-center gap-4 border-b border-line bg-ink px-4 text-white">
        <a href="/" className="text-lg font-semibold tracking-tight text-white no-underline hover:text-white">
          Spanwright
        </a>
        <span className="text-sm text-white/70" data-testid="organisation">{data.organisation.name}</span>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <NavLink to="/account" className="text-white no-underline hover:text-white/80 hover:underline">
            {data.user.name}
          </NavLink>
          <span className="hidden text-white/70 sm:inline" data-testid="roles">
            {data.roles.map((r) => ROLE_LABELS[r]).join(" · ")}
          </span>
          <Form method="post" action="/logout">
            <button type="submit" className="rounded border border-white/30 px-2 py-0.5 text-xs hover:bg-white/10">
              Sign out
            </button>
          </Form>
        </div>
      </header>
      <div className="flex flex-1">
        <nav aria-label="Main" className="w-48 shrink-0 border-r border-line bg-surface py-3">
          <ul>
            {data.nav.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  className={({ isActive }) =>
                    `block border-l-3 px-4 py-1.5 text-sm no-underline ${isActive ? "border-accent bg-accent-soft font-semibold text-accent-strong" : "border-transparent text-ink hover:bg-canvas"}`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <main className="min-w-0 flex-1 px-6 py-5">{children}</main>
      </div>
    </div>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const data = useRouteLoaderData<typeof loader>("routes/app-layout");
  if (!data) return <ErrorPanel error={error} />;
  return (
    <Shell data={data}>
      <ErrorPanel error={error} />
    </Shell>
  );
}
