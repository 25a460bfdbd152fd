/**
 * Display units. Storage and the engine are SI throughout; people may read and type US customary.
 * Conversion factors are exact by definition (1 ft = 0.3048 m, 1 lb = 0.45359237 kg,
 * 1 kt = 1852/3600 m/s, g0 = 9.80665 m/s²).
 */
export type UnitSystem = "SI" | "US";

export type Quantity = "length" | "area" | "mass" | "force" | "speed" | "altitude" | "moment" | "runningLoad" | "angle" | "none";

const FT = 0.3048;
const LB = 0.45359237;
const LBF = LB * 9.80665;
const KT = 1852 / 3600;

interface UnitDef {
  symbol: string;
  /** SI value = display value × factor. */
  factor: number;
}

const UNITS: Record<UnitSystem, Record<Quantity, UnitDef>> = {
  SI: {
    length: { symbol: "m", factor: 1 },
    area: { symbol: "m²", factor: 1 },
    mass: { symbol: "kg", factor: 1 },
    force: { symbol: "kN", factor: 1000 },
    speed: { symbol: "m/s", factor: 1 },
    altitude: { symbol: "m", factor: 1 },
    moment: { symbol: "kN·m", factor: 1000 },
    runningLoad: { symbol: "kN/m", factor: 1000 },
    angle: { symbol: "°", factor: 1 },
    none: { symbol: "", factor: 1 },
  },
  US: {
    length: { symbol: "ft", factor: FT },
    area: { symbol: "ft²", factor: FT * FT },
    mass: { symbol: "lb", factor: LB },
    force: { symbol: "lbf", factor: LBF },
    speed: { symbol: "kt", factor: KT },
    altitude: { symbol: "ft", factor: FT },
    moment: { symbol: "lbf·ft", factor: LBF * FT },
    runningLoad: { symbol: "lbf/ft", factor: LBF / FT },
    angle: { symbol: "°", factor: 1 },
    none: { symbol: "", factor: 1 },
  },
};

/** A unit system in words with its main units, as pages and the report name the units they show. */
export function unitSystemWords(system: UnitSystem): string {
  const u = (q: Quantity) => UNITS[system][q].symbol;
  return `${system === "SI" ? "SI" : "US customary"} (${u("length")}, ${u("mass")}, ${u("force")}, ${u("moment")}, ${u("speed")} EAS)`;
}

/** What units a document is in: SI always (stored and computed), and the chosen system beside it where someone chose another. */
export function unitsStatement(system: UnitSystem): string {
  return system === "SI" ? `${unitSystemWords("SI")}: stored, computed and shown` : `${unitSystemWords(system)} as chosen in the basis; stored and computed in ${unitSystemWords("SI")}`;
}

export function unitSymbol(system: UnitSystem, q: Quantity): string {
  return UNITS[system][q].symbol;
}

export function toSI(system: UnitSystem, q: Quantity, value: number): number {
  return value * UNITS[system][q].factor;
}

export function fromSI(system: UnitSystem, q: Quantity, value: number): number {
  return value / UNITS[system][q].factor;
}

/**
 * Below this size a shown value is the round-off of a zero (a tip's shear summed from opposite
 * signs, 1.37e-15): far below the smallest quantity any page shows in its own unit.
 */
const ROUND_OFF_OF_ZERO = 1e-9;

/**
 * A value as tables, tooltips and CSV downloads give it: 0 where it is within round-off of zero,
 * else rounded to `sig` significant figures (a number, so tables still sort by it).
 */
export function roundForDisplay(value: number, sig = 5): number {
  if (!Number.isFinite(value)) return value;
  if (Math.abs(value) < ROUND_OFF_OF_ZERO) return 0;
  return Number(value.toPrecision(sig));
}

/**
 * A number as en-GB's Intl.NumberFormat writes it with `minimumFractionDigits: min` and
 * `maximumFractionDigits: max` (rounded half away from zero, from the shortest decimal that reads
 * back as the same double — so 1.005 to two decimals is 1.01, where toFixed gives 1.00), digits in
 * groups of three; `group` separates the groups. Written out rather than asked of Intl: a page's
 * first Intl formatter loads the browser's locale data, 60–120 ms of its main thread while it
 * hydrates (measured in Chromium 156). "-0" is returned as it comes; callers decide.
 */
export function formatDecimal(value: number, max: number, min = 0, group = " "): string {
  if (!Number.isFinite(value)) return String(value);
  // The shortest round-trip digits and exponent: 1.005 → "1.005e+0", 31380 → "3.138e+4".
  const [mantissa, exponent] = Math.abs(value).toExponential().split("e") as [string, string];
  const digits = BigInt(mantissa.replace(".", ""));
  const shift = Number(exponent) - (mantissa.length - (mantissa.includes(".") ? 2 : 1)) + max;
  let scaled: bigint;
  if (shift >= 0) scaled = digits * 10n ** BigInt(shift);
  else {
    const unit = 10n ** BigInt(-shift);
    scaled = digits / unit + (2n * (digits % unit) >= unit ? 1n : 0n);
  }
  const text = scaled.toString().padStart(max + 1, "0");
  const whole = text.slice(0, text.length - max);
  let fraction = text.slice(text.length - max);
  while (fraction.length > min && fraction.endsWith("0")) fraction = fraction.slice(0, -1);
  const grouped = whole.length > 3 ? whole.replace(/\B(?=(\d{3})+$)/g, group) : whole;
  return `${value < 0 || Object.is(value, -0) ? "-" : ""}${grouped}${fraction ? `.${fraction}` : ""}`;
}

/** Rounds a converted value for display in an input, so 1 ft shows as 0.3048, not 0.30480000000000002. */
export function tidy(value: number): number {
  return Number.parseFloat(value.toPrecision(10));
}

/** A count as en-GB writes it: "100,000". */
export const formatCount = (n: number): string => formatDecimal(n, 0, 0, ",");

/** Rounds to a sensible number of significant figures for tables and read-outs; round-off of zero is "0". */
export function formatNumber(value: number | null | undefined, sig = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (roundForDisplay(value, sig) === 0) return "0";
  const digits = Math.min(Math.max(0, sig - 1 - Math.floor(Math.log10(Math.abs(value)))), 6);
  const text = formatDecimal(value, digits);
  // A small negative value rounded away is 0, not "-0".
  return text === "-0" ? "0" : text;
}

/** A value in display units with its symbol: "12.3 kN·m". */
export function formatQuantity(system: UnitSystem, q: Quantity, si: number | null | undefined, sig = 4): string {
  if (si === null || si === undefined) return "—";
  const sym = unitSymbol(system, q);
  return `${formatNumber(fromSI(system, q, si), sig)}${sym ? ` ${sym}` : ""}`;
}

/** The SI units engine messages are written in, and the quantity each stands for. */
const MESSAGE_UNITS: [symbol: string, q: Quantity][] = [
  ["N/m²", "none"],
  ["N·m", "moment"],
  ["m/s", "speed"],
  ["kg", "mass"],
  ["N", "force"],
  ["m", "length"],
];
const PSF_PER_PA = 1 / 47.880259; // 1 lbf/ft² = 4.4482216152605 N / 0.09290304 m² (NIST SP 811, B.8)

/**
 * An engine message with its SI quantities ("y = 3.250 m", "from y = 0.5–1.2 m", "W/S = 1 203 N/m²") in the
 * chosen system. The engine speaks SI (the exchange contract's messages stay so); pages show the chosen
 * units. Other numbers (Mach, cl, degrees) are left as written.
 */
export function messageInUnits(text: string, system: UnitSystem): string {
  if (system === "SI") return text;
  const num = String.raw`-?\d+(?:\.\d+)?(?:e[-+]?\d+)?`;
  const units = MESSAGE_UNITS.map(([s]) => s.replace("/", "\\/")).join("|");
  const re = new RegExp(String.raw`(${num})(?:(\s?–\s?)(${num}))?\s(${units})(?![\p{L}\d/²·])`, "gu");
  return text.replace(re, (_all, a: string, dash: string | undefined, b: string | undefined, unit: string) => {
    const q = MESSAGE_UNITS.find(([s]) => s === unit)![1];
    const conv = (v: string) => (unit === "N/m²" ? Number(v) * PSF_PER_PA : fromSI(system, q, Number(v)));
    // As many significant figures as the engine wrote (3 to 6).
    const sig = (v: string) => Math.min(6, Math.max(3, v.replace(/^-|e.*$/g, "").replace(".", "").replace(/^0+/, "").length));
    const show = (v: string) => formatNumber(conv(v), sig(v));
    const symbol = unit === "N/m²" ? "psf" : unitSymbol(system, q);
    return `${show(a)}${b !== undefined ? `${dash}${show(b)}` : ""} ${symbol}`;
  });
}
