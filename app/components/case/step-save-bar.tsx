import type { StepStatus } from "~/domain/vocabulary";
import { Button } from "~/components/ui/button";

/**
 * The foot of every step form: the save button with the revision the save will make, or why the
 * step is read-only (submitted for check, or a role that may not edit).
 */
export function StepSaveBar({ canEdit, status, revision, busy, label, onSave, voids = [] }: { canEdit: boolean; status: StepStatus; revision: number; busy: boolean; label: string; onSave?: () => void; voids?: readonly string[] }) {
  if (!canEdit) {
    return <p className="mt-4 text-sm text-ink-muted">{status === "submitted" ? "Submitted for check: read-only until returned or approved." : "Read-only for your role."}</p>;
  }
  return (
    <>
      {voids.length ? (
        <p className="mt-4 rounded border border-warn/40 bg-warn-soft px-3 py-2 text-sm" role="note" data-testid="voids-warning">
          <strong>⚠ Saving a change voids {voids.length} signature{voids.length > 1 ? "s" : ""}:</strong> {voids.join("; ")}. The steps go back to draft and need checking again; reports already issued stay as they are.
        </p>
      ) : null}
    <div className="mt-4 flex items-center gap-3" data-testid="step-save-bar">
      <Button type="submit" disabled={busy} onClick={onSave}>
        {busy ? "Saving…" : label}
      </Button>
      <span className="text-xs text-ink-muted">
        Revision {revision} · saving makes revision {revision + 1}
      </span>
    </div>
    </>
  );
}
