import { describe, expect, it } from "vitest";
import { DEFAULT_MAX_ROWS, FormFieldError, formDataToObject } from "./form-data";

const fd = (fields: [string, string][]) => {
  const f = new FormData();
  for (const [k, v] of fields) f.append(k, v);
  return f;
};

const refusal = (fn: () => unknown) => {
  try {
    fn();
  } catch (error) {
    if (error instanceof FormFieldError) return { field: error.field, message: error.message };
    throw error;
  }
  throw new Error("expected a FormFieldError");
};

describe("formDataToObject", () => {
  it("builds nested rows from dotted names", () => {
    expect(formDataToObject(fd([["stations.0.y", "0"], ["stations.1.y", "8"], ["axisRoot", "0.3"]]), { maxRows: 60 })).toEqual({ stations: [{ y: "0" }, { y: "8" }], axisRoot: "0.3" });
  });

  it("refuses a row number at or beyond the form's maximum before building any array", () => {
    expect(refusal(() => formDataToObject(fd([["stations.1000000.y", "1"]]), { maxRows: 60 }))).toEqual({ field: "stations.1000000.y", message: "Row 1000001 is beyond the 60 rows this form takes." });
    expect(refusal(() => formDataToObject(fd([["stations.60.y", "1"]]), { maxRows: 60 })).field).toBe("stations.60.y");
    expect(formDataToObject(fd([["stations.59.y", "1"]]), { maxRows: 60 }).stations).toHaveLength(60);
  });

  it("bounds forms that name no maximum, and refuses digit runs too long to be a row number", () => {
    expect(refusal(() => formDataToObject(fd([[`rows.${DEFAULT_MAX_ROWS}.y`, "1"]]))).field).toBe(`rows.${DEFAULT_MAX_ROWS}.y`);
    expect(refusal(() => formDataToObject(fd([[`rows.${"9".repeat(400)}.y`, "1"]]), { maxRows: 2000 })).message).toContain("beyond the 2000 rows");
  });

  it("refuses names nested deeper than any form, and shortens a long name in the answer", () => {
    const deep = Array.from({ length: 10_000 }, () => "a").join(".");
    const r = refusal(() => formDataToObject(fd([[deep, "1"]])));
    expect(r.message).toBe("This form has no field of that name.");
    expect(r.field.length).toBeLessThanOrEqual(81);
  });

  it("refuses a NUL character in a value or a name, naming the field", () => {
    expect(refusal(() => formDataToObject(fd([["title", "a\u0000b"]])))).toEqual({ field: "title", message: "The value must not contain the NUL character (U+0000)." });
    expect(refusal(() => formDataToObject(fd([["ti\u0000tle", "x"]]))).field).toBe("ti\\0tle");
  });

  it("never writes through a prototype", () => {
    const out = formDataToObject(fd([["__proto__.polluted", "yes"], ["a.constructor.prototype.x", "1"]]));
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(out).toEqual({ a: {} });
  });
});
