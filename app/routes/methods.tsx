import { requireUser } from "~/auth/auth.server";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { ENGINE_VERSION } from "~/engine";
import { METHOD_STATEMENT as METHODS } from "~/domain/method-statement";
import type { Route } from "./+types/methods";

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireUser({ request, context });
  return { engine: ENGINE_VERSION };
}


export default function MethodsRoute({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader
        title="Method statement"
        description={`The published methods behind every result, and where they stop being valid. Engine version ${loaderData.engine}.`}
      />
      <p className="mb-4 max-w-3xl rounded border border-warn/40 bg-warn-soft px-3 py-2 text-sm text-warn">
        Spanwright's results support, and do not replace, the analysis that the certifying authority accepts. The applicable regulations and licensed engineering practice govern; the engineer remains responsible for the results and their use.
      </p>
      <div className="grid max-w-5xl gap-4">
        {METHODS.map((m) => (
          <Panel key={m.title} title={m.title}>
            {m.body.map((p) => (
              <p key={p} className="mb-2 text-sm last:mb-0">
                {p}
              </p>
            ))}
          </Panel>
        ))}
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Method statement · Spanwright" }];
}
