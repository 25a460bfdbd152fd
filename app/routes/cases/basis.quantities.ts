import type { Quantity } from "~/domain/units";

// Apart from basis.schema.ts (zod), which the basis page loads only when its form is first checked.

/** The basis fields that carry a unit, and which quantity each is. */
export const BASIS_QUANTITIES = {
  mtow: "mass",
  mzfw: "mass",
  minWeight: "mass",
  vs1: "speed",
  va: "speed",
  vb: "speed",
  mlw: "mass",
  zmo: "altitude",
  vc: "speed",
  vd: "speed",
  vf: "speed",
  altitudes: "altitude",
  wingArea: "area",
} as const satisfies Record<string, Quantity>;

/** The basis form's fields (what the server may name in a refusal shown beside a field); step-forms.test.ts checks them against the schema. */
export const BASIS_FIELDS = ["units", "category", "regulations", "mtow", "mzfw", "minWeight", "vs1", "va", "vb", "mlw", "zmo", "vc", "vd", "altitudes", "wingArea", "clMax", "clMaxNegative", "vf", "clMaxFlaps"] as const;
