import { DomainError } from "@/lib/errors";

export const temperatureUnits = ["C", "F"] as const;
export type TemperatureUnit = (typeof temperatureUnits)[number];

export function convertFahrenheitToCelsius(f: number): number {
  return ((f - 32) * 5) / 9;
}

export function convertCelsiusToFahrenheit(c: number): number {
  return (c * 9) / 5 + 32;
}

export function convertToCelsius(value: number, unit: TemperatureUnit): number {
  if (!Number.isFinite(value)) throw new DomainError("A temperature must be a number.");
  return unit === "F" ? convertFahrenheitToCelsius(value) : value;
}

export function convertFromCelsius(celsius: number, unit: TemperatureUnit): number {
  return unit === "F" ? convertCelsiusToFahrenheit(celsius) : celsius;
}

/** "3.5 °C" / "38.3 °F"; a real minus sign, and no "-0.0". */
export function formatTemperature(celsius: number, unit: TemperatureUnit = "C", decimals = 1): string {
  const value = convertFromCelsius(celsius, unit);
  let text = value.toFixed(decimals);
  if (Number(text) === 0) text = (0).toFixed(decimals);
  return `${text.replace("-", "−")} °${unit}`;
}

/** Reads what a grower types: "4", "4.5", "-18", "−18 °C", "39F", "39 °f", "4,5". Falls back to `defaultUnit`. */
export function parseTemperature(text: string, defaultUnit: TemperatureUnit = "C"): { celsius: number; unit: TemperatureUnit } {
  const cleaned = text.trim().replace("−", "-").replace(",", ".");
  const m = /^([+-]?\d+(?:\.\d+)?)\s*(?:°|º|deg)?\s*([cCfF])?$/.exec(cleaned);
  if (!m) throw new DomainError(`"${text}" is not a temperature; type a number such as 4 or 39 °F.`);
  const unit = (m[2]?.toUpperCase() as TemperatureUnit | undefined) ?? defaultUnit;
  return { celsius: convertToCelsius(Number(m[1]), unit), unit };
}
