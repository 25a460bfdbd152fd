import { describe, expect, it } from "vitest";
import { shownChange } from "./input-fields";
import { unitsStatement } from "./units";

// Exact unit definitions (NIST SP 811, appendix B): 1 ft = 0.3048 m, 1 lb = 0.45359237 kg,
// 1 lbf = 4.4482216152605 N. Each stored SI value below is a round number of US units by these
// definitions, so the expected text is written here, not taken from the application.

describe("a changed input as the comparison shows it", () => {
  it("names the field in words with its unit and converts the stored SI values to the units shown", () => {
    // 1828.8 m = 6000 ft; 3048 m = 10 000 ft.
    expect(shownChange({ step: "envelope", field: "cases › W7-A › altitude", before: "1828.8", after: "3048" }, "US")).toEqual({ field: "Load cases › W7-A › Altitude [ft]", before: "6 000", after: "10 000" });
    // 453.59237 kg = 1000 lb; 4448.2216152605 N = 1000 lbf.
    expect(shownChange({ step: "basis", field: "mtow", before: "453.59237", after: "907.18474" }, "US")).toEqual({ field: "Max take-off weight [lb]", before: "1 000", after: "2 000" });
    expect(shownChange({ step: "envelope", field: "cases › G1 › tailLoad", before: "4448.2216152605", after: "(none)" }, "US")).toEqual({ field: "Load cases › G1 › Tail load [lbf]", before: "1 000", after: "(none)" });
    // A list's element takes the list's unit: 0.9144 m = 3 ft.
    expect(shownChange({ step: "planform", field: "stations › row 2 › chord", before: "0.9144", after: "1.2192" }, "US")).toEqual({ field: "Stations › row 2 › Chord [ft]", before: "3", after: "4" });
    expect(shownChange({ step: "basis", field: "altitudes", before: "[0,3048]", after: "[0,3048,6096]" }, "US")).toEqual({ field: "Altitudes [ft]", before: "0, 10 000", after: "0, 10 000, 20 000" });
  });

  it("writes a whole row added or removed field by field, each with its unit", () => {
    const added = shownChange({ step: "masses", field: "items › battery", before: "(none)", after: '{"id":"battery","kg":45.359237,"x":0.3048}' }, "US");
    expect(added).toEqual({ field: "Mass items › battery", before: "(none)", after: "id: battery; Mass [lb]: 100; x of CG [ft]: 1" });
  });

  it("keeps SI values as stored in SI, and words and unitless numbers as they are", () => {
    expect(shownChange({ step: "envelope", field: "cases › W7-A › altitude", before: "1828.8", after: "3048" }, "SI")).toEqual({ field: "Load cases › W7-A › Altitude [m]", before: "1 828.8", after: "3 048" });
    expect(shownChange({ step: "envelope", field: "compressibility", before: "prandtl-glauert", after: "laitone" }, "US")).toEqual({ field: "Compressibility rule", before: "prandtl-glauert", after: "laitone" });
    expect(shownChange({ step: "envelope", field: "cases › W7-A › nz", before: "2.5", after: "3.8" }, "US")).toEqual({ field: "Load cases › W7-A › nz", before: "2.5", after: "3.8" });
  });
});

describe("the units a document states", () => {
  it("is SI always, with the chosen system beside it where someone chose another", () => {
    expect(unitsStatement("SI")).toBe("SI (m, kg, kN, kN·m, m/s EAS): stored, computed and shown");
    expect(unitsStatement("US")).toBe("US customary (ft, lb, lbf, lbf·ft, kt EAS) as chosen in the basis; stored and computed in SI (m, kg, kN, kN·m, m/s EAS)");
  });
});
