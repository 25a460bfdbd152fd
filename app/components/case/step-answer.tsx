import type { ActionAnswer } from "~/utils/form-data";
import { Alert } from "~/components/ui/page-header";

/**
 * Above a step form: the saved revision, or what the server refused that no field of the form
 * shows beside it (a stale revision, a read-only step, a rule of the whole form). `inline` names
 * the fields that show their own messages; a name ending in "." covers a grid's cells ("stations.").
 */
export function StepAnswer({ answer, inline }: { answer: ActionAnswer | undefined; inline: readonly string[] }) {
  if (!answer) return null;
  if (answer.ok) {
    return answer.message ? (
      <div className="mb-3">
        <Alert tone="info">{answer.message}</Alert>
      </div>
    ) : null;
  }
  const shownInline = (key: string) => inline.some((name) => (name.endsWith(".") ? key.startsWith(name) : key === name));
  const general = Object.entries(answer.fieldErrors)
    .filter(([key]) => !shownInline(key))
    .flatMap(([, messages]) => messages ?? []);
  return general.length ? (
    <div className="mb-3">
      <Alert>{[...new Set(general)].join(" ")}</Alert>
    </div>
  ) : null;
}
