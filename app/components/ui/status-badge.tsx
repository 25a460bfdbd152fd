import type { CaseStatus } from "~/db/schema";

// Each status has its own colour, word and icon shape, so it never rests on colour alone.
const STATUS: Record<CaseStatus, { label: string; icon: string; className: string }> = {
  draft: { label: "Draft", icon: "○", className: "text-status-draft border-status-draft/40 bg-canvas" },
  submitted: { label: "Submitted", icon: "◔", className: "text-status-submitted border-status-submitted/40 bg-accent-soft" },
  returned: { label: "Returned", icon: "↺", className: "text-status-returned border-status-returned/40 bg-warn-soft" },
  approved: { label: "Approved", icon: "✓", className: "text-status-approved border-status-approved/40 bg-[#e8f4ec]" },
  issued: { label: "Issued", icon: "■", className: "text-status-issued border-status-issued/40 bg-[#f1ecf8]" },
  released: { label: "Released", icon: "★", className: "text-status-released border-status-released/40 bg-[#e6f3f3]" },
};

export function StatusBadge({ status }: { status: CaseStatus }) {
  const s = STATUS[status];
  return (
    <span className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold ${s.className}`}>
      <span aria-hidden="true">{s.icon}</span>
      {s.label}
    </span>
  );
}
