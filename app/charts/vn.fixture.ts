import { vnOption } from "./vn";

/*
 * A V–n diagram of the demo's kind for the charts' tests (vn.test.ts, svg.server.test.ts): a Part 23
 * wing with flaps (flaps-A, flaps-VF and the VF gusts) and the rolling conditions, unsym-A on corner A
 * and roll-VA beside flaps-VF. Speeds in m/s, shown as they are.
 */
export const DEMO_VN_POINTS = [
  { name: "S", veas: 50, nz: 1, rule: "stall" },
  { name: "A", veas: 89, nz: 3.1, rule: "corner" },
  { name: "gust+VB", veas: 88, nz: 2.9, rule: "gust" },
  { name: "D", veas: 155, nz: 3.1, rule: "corner" },
  { name: "gust-VD", veas: 155, nz: 0.2, rule: "gust" },
  { name: "tuned+VD", veas: 155, nz: 1.9, rule: "tuned gust" },
  { name: "flaps-A", veas: 59.2, nz: 2, rule: "14 CFR 23.345(a)(1)" },
  { name: "flaps-VF", veas: 77, nz: 2, rule: "14 CFR 23.345(a)(1)" },
  { name: "flaps-gust+VF", veas: 77, nz: 1.8, rule: "14 CFR 23.345(a)(2)" },
  { name: "flaps-gust-VF", veas: 77, nz: 0.2, rule: "14 CFR 23.345(a)(2)" },
  { name: "unsym-A", veas: 89, nz: 3.1, rule: "14 CFR 23.349(a)", roll: { fraction: 0.75, aileron: 0 } },
  { name: "roll-VA", veas: 89, nz: 2.0667, rule: "14 CFR 23.349(b)", roll: { fraction: 1, aileron: 17 } },
  { name: "roll-VC", veas: 112, nz: 2.0667, rule: "14 CFR 23.349(b)", roll: { fraction: 1, aileron: 13.5 } },
  { name: "roll-VD", veas: 155, nz: 2.0667, rule: "14 CFR 23.349(b)", roll: { fraction: 1, aileron: 3.25 } },
];

/** The diagram's option, speeds shown in m/s. */
export const demoVnOption = () => vnOption("V–n", DEMO_VN_POINTS, { area: 27.6, clMax: 1.45, clMaxNegative: -0.9, weightN: 62272, clMaxFlaps: 2.1 }, { symbol: "m/s", fromSI: (v) => v });
