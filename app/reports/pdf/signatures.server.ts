import { STEPS } from "~/domain/steps";
import { STEP_KEYS } from "~/domain/vocabulary";
import type { SignatureLine } from "../snapshot";
import { M, MUTED, utc, type Column, type Section } from "./layout.server";

const STEP_LABEL: Record<string, string> = Object.fromEntries(STEPS.map((s) => [s.key, s.label]));

/** Every live signature behind the report, by step, then the approval for issue. */
export function signatures({ w, s }: Section) {
  w.heading("Signatures", { newPage: true });
  w.para(
    "Each step was signed on the revision shown; its hash is the SHA-256 of the canonical serialisation of that revision (case, step, revision and data). The approval for issue signs the hashes of every step's signed revision. The release by quality signs the SHA-256 of this PDF's bytes, so it is recorded in Spanwright after issue and listed with the report there. Times are UTC.",
    { size: 8.4, color: MUTED },
  );
  const cols: Column[] = [
    { header: "Name", width: 92 },
    { header: "Role", width: 54 },
    { header: "Meaning", width: 96 },
    { header: "Signed (UTC)", width: 86 },
    { header: "Revision", width: 40, align: "right" },
    { header: "Revision hash (SHA-256)", width: 0 },
  ];
  const row = (g: SignatureLine) => [g.name, g.role, g.meaning, utc(g.signedAt), g.revision === null ? "—" : `${g.revision}`, g.revisionHash];
  const groups = [...STEP_KEYS.map((k) => ({ key: k as string | null, title: `${STEP_LABEL[k]} step` })), { key: null, title: "Approval of the case for issue" }];
  const other = s.signatures.filter((g) => g.step !== null && !(STEP_KEYS as readonly string[]).includes(g.step));
  for (const grp of groups) {
    const lines = s.signatures.filter((g) => g.step === grp.key);
    if (lines.length === 0) {
      w.ensure(30);
      w.text(`${grp.title}: no signature recorded.`, M.left, w.y, { size: 8.4, color: MUTED, oneLine: true });
      w.y += 16;
      continue;
    }
    w.table(cols, lines.map(row), { caption: grp.title, size: 7.6 });
  }
  if (other.length) w.table(cols, other.map(row), { caption: "Other signatures", size: 7.6 });
}
