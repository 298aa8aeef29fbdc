import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { convertCelsiusToFahrenheit, convertFahrenheitToCelsius, formatTemperature, parseTemperature } from "@/lib/domain";

describe("°C / °F", () => {
  it.each([
    [0, 32], // freezing point of water
    [100, 212], // boiling point at sea level
    [4, 39.2], // US FDA refrigerator: at or below 4 °C (40 °F)
    [-18, -0.4], // US FDA freezer: −18 °C (0 °F)
    [-40, -40], // the scales cross
  ])("%d °C = %d °F", (c, f) => {
    expect(convertCelsiusToFahrenheit(c)).toBeCloseTo(f, 10);
    expect(convertFahrenheitToCelsius(f)).toBeCloseTo(c, 10);
  });

  it("round-trips (property)", () => {
    fc.assert(fc.property(fc.double({ min: -100, max: 100, noNaN: true }), (c) => {
        expect(convertFahrenheitToCelsius(convertCelsiusToFahrenheit(c))).toBeCloseTo(c, 9);
      }),
    );
  });

  it.each([
    [4, "C", "4.0 °C"],
    [4, "F", "39.2 °F"],
    [-18, "C", "−18.0 °C"],
    [-0.01, "C", "0.0 °C"],
  ] as const)("formats %d °C in %s as %s", (c, unit, text) => {
    expect(formatTemperature(c, unit)).toBe(text);
  });

  it.each([
    ["4", "C", 4, "C"],
    ["4,5", "C", 4.5, "C"],
    ["−18 °C", "F", -18, "C"],
    ["39.2F", "C", 4, "F"],
    ["32 °f", "C", 0, "F"],
    ["40", "F", 4.444444444444445, "F"],
  ] as const)("reads %j (default %s)", (text, unit, celsius, seen) => {
    const r = parseTemperature(text, unit);
    expect(r.celsius).toBeCloseTo(celsius, 10);
    expect(r.unit).toBe(seen);
  });

  it.each(["", "warm", "4 K", "--4"])("refuses %j in words", (text) => {
    expect(() => parseTemperature(text)).toThrow(/is not a temperature/);
  });
});
