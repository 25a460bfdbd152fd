import { STEPS } from "~/domain/steps";
import { STEP_KEYS } from "~/domain/vocabulary";
import type { SignatureLine } from "../snapshot";
import { M, MUTED, utc, type Column, type Section } from "./layout.server";

const STEP_LABEL: Record<string, string> = Object.fromEntries(STEPS.map((s) => [s.key, s.label]));

/** Who signed the case in each capacity, by the meaning of their signatures. */
const CAPACITIES = [
  { label: "Prepared by", meaning: "prepared" },
  { label: "Checked by", meaning: "checked" },
  { label: "Approved for issue by", meaning: "approved for issue" },
] as const;

/** One capacity's signers: each person with their role, how many steps they signed and when; the approval with its hash. */
function signOff(lines: SignatureLine[], meaning: string): string {
  const own = lines.filter((g) => g.meaning === meaning);
  if (own.length === 0) return "no signature recorded";
  if (meaning === "approved for issue") return own.map((g) => `${g.name} (${g.role}), ${utc(g.signedAt)}, hash ${g.revisionHash}`).join("; ");
  const people = [...new Set(own.map((g) => `${g.name}\u0000${g.role}`))];
  return people
    .map((key) => {
      const [name, role] = key.split("\u0000");
      const theirs = own.filter((g) => g.name === name && g.role === role).map((g) => g.signedAt).sort();
      const when = theirs.length > 1 ? `${utc(theirs[0]!)} to ${utc(theirs.at(-1)!)}` : utc(theirs[0]!);
      return `${name} (${role}), ${theirs.length} step${theirs.length > 1 ? "s" : ""}, ${when}`;
    })
    .join("; ");
}

/** The sign-off (preparer, checker, approver), then every live signature behind the report, by step, then the approval for issue. */
export function signatures({ w, s }: Section) {
  w.heading("Signatures", { newPage: true });
  w.para(
    "The engineer who submitted each step signed it as prepared, and the checker signed it as checked, both on the revision shown; its hash is the SHA-256 of the canonical serialisation of that revision (case, step, revision and data). The approval for issue signs the hashes of every step's checked revision. The release by quality signs the SHA-256 of this PDF's bytes, so it is recorded in Spanwright after issue and listed with the report there. Times are UTC.",
    { size: 8.4, color: MUTED },
  );
  w.subheading("Sign-off");
  w.facts(CAPACITIES.map((c) => [c.label, signOff(s.signatures, c.meaning)]));
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
