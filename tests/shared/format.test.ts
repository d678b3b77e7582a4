// The one formatting module: checked against the arithmetic it stands for (rounding within half a
// unit of the last digit), against Date.prototype.toISOString for times, and on written examples.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { count, deg, editable, fixed, magnitude, mm, pct, price, significant, upTo, utc, utcDate } from "@/shared/format";

describe("numbers", () => {
  it("fixed rounds to within half a unit of the last decimal and never groups", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), fc.integer({ min: 0, max: 6 }), (v, d) => {
        const s = fixed(v, d);
        expect(s).toMatch(d === 0 ? /^-?\d+$/ : new RegExp(`^-?\\d+\\.\\d{${d}}$`));
        expect(Math.abs(Number(s) - v)).toBeLessThanOrEqual(0.5 * 10 ** -d * (1 + 1e-9) + Math.abs(v) * 1e-15);
      }),
    );
  });

  it("shows negative zero and tiny negatives as zero, missing values as a dash", () => {
    expect(fixed(-0, 2)).toBe("0.00");
    expect(fixed(-0.001, 2)).toBe("0.00");
    expect(fixed(-0.006, 2)).toBe("-0.01");
    expect(fixed(NaN)).toBe("–");
    expect(fixed(Infinity)).toBe("–");
    expect(fixed(null)).toBe("–");
    expect(upTo(2.5, 3)).toBe("2.5");
    expect(upTo(12, 3)).toBe("12");
    expect(upTo(-0.0001, 3)).toBe("0");
  });

  it("editable keeps 9 significant digits and reads back as the number", () => {
    expect(editable(100.00000000000001)).toBe("100");
    expect(editable((Math.PI / 2) * (180 / Math.PI))).toBe("90");
    expect(editable(0.00005 * 1000)).toBe("0.05");
    expect(editable(-0)).toBe("0");
    expect(editable(undefined)).toBe("");
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), (v) => {
        const back = Number(editable(v));
        expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 5e-9 + 1e-300);
      }),
    );
  });

  it("groups counts and prices, with the currency code", () => {
    expect(count(1048576)).toBe("1,048,576");
    expect(price(21000, "EUR").replace(/\u00a0/g, " ")).toBe("EUR 21,000");
    expect(price(18999.5, "USD").replace(/\u00a0/g, " ")).toBe("USD 18,999.50");
    expect(price(21000)).toBe("21,000");
    expect(price(undefined, "EUR")).toBe("–");
  });

  it("significant gives the digits toPrecision gives, without exponents", () => {
    for (const [v, d] of [[12.345, 3], [0.0001234, 3], [9.99, 2], [1234.5, 2]] as const) {
      expect(Number(significant(v, d))).toBe(Number(v.toPrecision(d)));
    }
    expect(significant(0.0001234, 3)).toBe("0.000123");
    expect(significant(1234.5, 2)).toBe("1200");
    expect(magnitude(1234.4)).toBe("1234");
    expect(magnitude(12.345)).toBe("12.3");
  });

  it("writes values with their display units", () => {
    expect(mm(0.00425)).toBe("4.25 mm");
    expect(mm(0.8125)).toBe("812.5 mm");
    expect(deg(Math.PI / 4)).toBe("45.0°");
    expect(pct(0.834)).toBe("83 %");
  });
});

describe("times", () => {
  it("agrees with toISOString for any instant", () => {
    fc.assert(
      fc.property(fc.date({ min: new Date("1970-01-01T00:00:00Z"), max: new Date("2200-01-01T00:00:00Z"), noInvalidDate: true }), (d) => {
        const iso = d.toISOString();
        expect(utc(d)).toBe(`${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`);
        expect(utc(iso, { seconds: true })).toBe(`${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`);
        expect(utcDate(d)).toBe(iso.slice(0, 10));
      }),
    );
  });

  it("shows a dash (or the text asked for) when there is no time", () => {
    expect(utc(null)).toBe("–");
    expect(utcDate(undefined, "never")).toBe("never");
    expect(utc("not a date")).toBe("–");
  });
});
