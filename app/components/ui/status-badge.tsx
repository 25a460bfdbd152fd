import { CASE_STATUS_LABELS, type CaseStatus } from "~/domain/vocabulary";

// Each status has its own colour besides its word and icon shape, so it never rests on colour alone.
const COLOUR: Record<CaseStatus, string> = {
  draft: "text-status-draft border-status-draft/40 bg-canvas",
  submitted: "text-status-submitted border-status-submitted/40 bg-accent-soft",
  returned: "text-status-returned border-status-returned/40 bg-warn-soft",
  approved: "text-status-approved border-status-approved/40 bg-[#e8f4ec]",
  issued: "text-status-issued border-status-issued/40 bg-[#f1ecf8]",
  released: "text-status-released border-status-released/40 bg-[#e6f3f3]",
};

export function StatusBadge({ status }: { status: CaseStatus }) {
  const s = { ...CASE_STATUS_LABELS[status], className: COLOUR[status] };
  return (
    <span className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold ${s.className}`}>
      <span aria-hidden="true">{s.icon}</span>
      {s.label}
    </span>
  );
}
