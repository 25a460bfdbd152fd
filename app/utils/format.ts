/** UTC date-time as engineers and auditors read it: 2026-12-01 16:54 UTC. */
export function formatUtc(value: Date | string | null | undefined): string {
  if (!value) return "—";
  const d = typeof value === "string" ? new Date(value) : value;
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
