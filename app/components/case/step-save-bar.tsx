import type { StepStatus } from "~/domain/vocabulary";
import { Button } from "~/components/ui/button";

/**
 * The foot of every step form: the save button with the revision the save will make, or why the
 * step is read-only (submitted for check, or a role that may not edit).
 */
export function StepSaveBar({ canEdit, status, revision, busy, label, onSave }: { canEdit: boolean; status: StepStatus; revision: number; busy: boolean; label: string; onSave?: () => void }) {
  if (!canEdit) {
    return <p className="mt-4 text-sm text-ink-muted">{status === "submitted" ? "Submitted for check: read-only until returned or approved." : "Read-only for your role."}</p>;
  }
  return (
    <div className="mt-4 flex items-center gap-3">
      <Button type="submit" disabled={busy} onClick={onSave}>
        {busy ? "Saving…" : label}
      </Button>
      <span className="text-xs text-ink-muted">
        Revision {revision} · saving makes revision {revision + 1}
      </span>
    </div>
  );
}
