/**
 * How numbers, prices and times are written for people: pages, forms, exports, reason sentences
 * and the command line all format through here, on Intl.NumberFormat and Intl.DateTimeFormat.
 *
 * One locale rule: British English (`en-GB`): "." before decimals, "," between thousands where
 * thousands are grouped (counts, byte sizes, prices), never in measured values (mm, °, N, kg, ratios),
 * which stay plain so they read and paste as numbers. A value that is not a finite number shows as
 * "–". Negative zero shows as "0". Times are UTC, written year-first ("2026-01-02 03:04 UTC").
 * Prices use the currency style with the ISO code the arm's datasheet gives ("EUR 21,000").
 */

const LOCALE = "en-GB";

/** The text shown for a value that is missing or not a finite number. */
const MISSING = "–";

const numberFormats = new Map<string, Intl.NumberFormat>();

function numberFormat(options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = JSON.stringify(options);
  let f = numberFormats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(LOCALE, { signDisplay: "negative", ...options });
    numberFormats.set(key, f);
  }
  return f;
}

const finite = (v: number | null | undefined): v is number => typeof v === "number" && Number.isFinite(v);

/** A measured value with exactly `decimals` decimals, not grouped ("1234.50"); "–" when missing. */
export function fixed(v: number | null | undefined, decimals = 2): string {
  if (!finite(v)) return MISSING;
  return numberFormat({ useGrouping: false, minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(v);
}

/** A measured value with at most `decimals` decimals, trailing zeros dropped ("0.5", "12"); "–" when missing. */
export function upTo(v: number | null | undefined, decimals: number): string {
  if (!finite(v)) return MISSING;
  return numberFormat({ useGrouping: false, minimumFractionDigits: 0, maximumFractionDigits: decimals }).format(v);
}

/**
 * A value as a form shows it for editing: up to 9 significant digits, not grouped, so float noise
 * (100.00000000000001) and the last digits of angles stored as rounded radians (90.0000000017°)
 * do not show, and the text reads back as the number; `empty` when missing.
 */
export function editable(v: number | null | undefined, empty = ""): string {
  if (!finite(v)) return empty;
  return numberFormat({ useGrouping: false, maximumSignificantDigits: 9 }).format(v);
}

/** A measured value with exactly `digits` significant digits, not grouped ("0.000123", "12.3"); "–" when missing. */
export function significant(v: number | null | undefined, digits: number): string {
  if (!finite(v)) return MISSING;
  return numberFormat({ useGrouping: false, minimumSignificantDigits: digits, maximumSignificantDigits: digits }).format(v);
}

/** A magnitude read at a glance (forces, radii): whole from 100 up, else three significant digits. */
export const magnitude = (v: number): string => (v >= 100 ? fixed(v, 0) : significant(v, 3));

/** A whole count with thousands grouped ("1,048,576"). */
export function count(n: number): string {
  return finite(n) ? numberFormat({ maximumFractionDigits: 0 }).format(n) : MISSING;
}

/**
 * A price: currency style with the ISO 4217 code, whole units unless it has cents ("EUR 21,000",
 * "EUR 18,999.50"); without a currency code the grouped number alone; "–" when missing.
 */
export function price(v: number | null | undefined, currency?: string | null): string {
  if (!finite(v)) return MISSING;
  const decimals = Math.round(v * 100) % 100 === 0 ? 0 : 2;
  const digits = { minimumFractionDigits: decimals, maximumFractionDigits: decimals };
  return numberFormat(currency ? { style: "currency", currency, currencyDisplay: "code", ...digits } : digits).format(v);
}

// ---- Values with their display units (SI inside, mm and degrees shown) ----

/** Metres as millimetres: two decimals below 10 mm, one above ("4.25 mm", "812.5 mm"). */
export const mm = (m: number): string => `${fixed(m * 1000, m * 1000 < 10 ? 2 : 1)} mm`;
/** Radians as degrees with one decimal ("12.5°"). */
export const deg = (rad: number): string => `${fixed((rad * 180) / Math.PI, 1)}°`;
/** A plain measured number with `d` decimals (ratios, margins, N, N·m). */
export const num = (v: number, d = 2): string => fixed(v, d);
/** A fraction as a whole percentage ("83 %"). */
export const pct = (fraction: number): string => `${fixed(fraction * 100, 0)} %`;

// ---- Times (UTC) ----

const dateParts = new Intl.DateTimeFormat(LOCALE, {
  timeZone: "UTC", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", hourCycle: "h23",
});

function parts(d: Date): Record<"year" | "month" | "day" | "hour" | "minute" | "second", string> {
  const out: Record<string, string> = {};
  for (const p of dateParts.formatToParts(d)) out[p.type] = p.value;
  return out as Record<"year" | "month" | "day" | "hour" | "minute" | "second", string>;
}

const toDate = (t: string | Date | null | undefined): Date | null => {
  if (!t) return null;
  const d = typeof t === "string" ? new Date(t) : t;
  return Number.isNaN(d.getTime()) ? null : d;
};

/** A UTC date, "2026-01-02"; `empty` when there is none. */
export function utcDate(t: string | Date | null | undefined, empty = MISSING): string {
  const d = toDate(t);
  if (!d) return empty;
  const p = parts(d);
  return `${p.year}-${p.month}-${p.day}`;
}

/** A UTC time to the minute, "2026-01-02 03:04 UTC" (with `seconds`, "03:04:05 UTC"); "–" when there is none. */
export function utc(t: string | Date | null | undefined, opts: { seconds?: boolean } = {}): string {
  const d = toDate(t);
  if (!d) return MISSING;
  const p = parts(d);
  return `${p.year}-${p.month}-${p.day} ${p.hour}:${p.minute}${opts.seconds ? `:${p.second}` : ""} UTC`;
}
