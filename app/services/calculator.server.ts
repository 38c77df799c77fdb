import { z } from "zod";
import {
  computeThermochemistry,
  convertTemperature,
  parseFrequencyList,
  resolveStandardState,
  ThermoInputError,
  type StandardState,
} from "../domain/thermo";
import { ServiceError } from "../utils/http.server";

/**
 * The stand-alone thermochemistry calculator (page and POST /api/v1/thermo): frequencies and a geometry
 * in, ideal-gas RRHO corrections out. Stateless; every number comes from app/domain/thermo.
 */
const finite = z.number().refine(Number.isFinite, "must be a finite number");

export const calculatorInputSchema = z
  .object({
    frequencies: z.array(finite, { message: "frequencies must be an array of numbers in cm⁻¹" }),
    geometry: z
      .union([
        z.object({ format: z.literal("xyz"), data: z.string().min(1, "the XYZ text is empty") }),
        z.object({
          symbols: z.array(z.string().min(1)).min(1, "give at least one atom"),
          coordinates: z.array(z.tuple([finite, finite, finite])).min(1),
        }),
      ])
      .optional(),
    symmetryNumber: z.number().int("must be a whole number").min(1, "must be at least 1").default(1),
    multiplicity: z.number().int("must be a whole number").min(1, "must be at least 1").default(1),
    charge: z.number().int("must be a whole number").default(0),
    temperature: finite.refine((t) => t > 0, "must be above 0 K").default(298.15),
    pressure: finite.refine((p) => p > 0, "must be above 0 Pa").optional(),
    standardState: z.enum(["1 bar", "1 atm", "1 M"], { message: 'must be "1 bar", "1 atm" or "1 M"' }).optional(),
    lowFrequency: z
      .object({
        treatment: z.enum(["none", "grimme", "truhlar"], { message: 'must be "none", "grimme" or "truhlar"' }),
        cutoff: finite.refine((c) => c > 0, "must be above 0 cm⁻¹").default(100),
      })
      .default({ treatment: "none", cutoff: 100 }),
    frequencyScale: finite.refine((s) => s > 0, "must be above 0").default(1),
    masses: z.enum(["isotopic", "average"], { message: 'must be "isotopic" or "average"' }).default("isotopic"),
  })
  .refine((v) => !(v.pressure !== undefined && v.standardState !== undefined), {
    path: ["pressure"],
    message: "give either pressure or standardState, not both",
  });

export type CalculatorInput = z.input<typeof calculatorInputSchema>;

export function runCalculator(raw: CalculatorInput) {
  const parsed = calculatorInputSchema.safeParse(raw);
  if (!parsed.success) {
    throw new ServiceError(
      422,
      "invalid_input",
      "Some fields are not valid",
      parsed.error.issues.map((i) => ({ field: i.path.join(".") || undefined, message: i.message })),
    );
  }
  const input = parsed.data;
  try {
    const state: StandardState | null = input.standardState ?? (input.pressure === undefined ? "1 atm" : null);
    const resolved = state ? resolveStandardState(state, input.temperature) : null;
    const pressurePa = resolved ? resolved.pressurePa : input.pressure!;
    const geometry = !input.geometry
      ? undefined
      : "format" in input.geometry
        ? input.geometry.data
        : { symbols: input.geometry.symbols, coordinates: input.geometry.coordinates };
    const result = computeThermochemistry({
      frequenciesCm1: input.frequencies,
      geometry,
      symmetryNumber: input.symmetryNumber,
      multiplicity: input.multiplicity,
      charge: input.charge,
      temperatureK: input.temperature,
      pressurePa,
      frequencyScale: input.frequencyScale,
      lowFrequency: { treatment: input.lowFrequency.treatment, cutoffCm1: input.lowFrequency.cutoff },
      masses: input.masses,
      perMode: true,
    });
    const correction = resolved?.correctionHartree ?? 0;
    return {
      temperature: result.temperatureK,
      pressure: result.pressurePa,
      standardState: {
        name: state ?? `${pressurePa} Pa`,
        correction,
        description: resolved?.description ?? `Ideal gas at ${pressurePa} Pa.`,
        note: "gibbsCorrection includes this correction; gibbsCorrectionAtPressure does not",
      },
      units: result.units,
      zpe: result.zpe,
      thermalEnergy: result.thermalEnergy,
      enthalpyCorrection: result.enthalpyCorrection,
      entropy: result.entropy,
      gibbsCorrection: result.gibbsCorrection + correction,
      gibbsCorrectionAtPressure: result.gibbsCorrection,
      contributions: result.contributions,
      imaginaryFrequencies: result.imaginaryFrequencies,
      linear: result.linear,
      atom: result.atom,
      principalMoments: result.principalMoments,
      rotationalTemperatures: result.rotationalTemperaturesK,
      molecularMass: result.molecularMass,
      symmetryNumber: result.symmetryNumber,
      multiplicity: result.multiplicity,
      frequencyScale: result.frequencyScale,
      masses: result.masses,
      lowFrequency: {
        treatment: result.lowFrequency.treatment,
        cutoff: result.lowFrequency.cutoffCm1,
        affectedFrequencies: result.lowFrequency.affectedFrequenciesCm1,
        description: result.lowFrequency.description,
      },
      perMode: result.perMode,
      warnings: result.warnings,
      model:
        "Ideal gas, rigid rotor, harmonic oscillator (McQuarrie). Values are model estimates: they rest on the " +
        "stored frequencies and geometry and are no substitute for measured data.",
    };
  } catch (error) {
    if (error instanceof ThermoInputError) {
      const field = apiFieldOf(error.field);
      throw new ServiceError(422, "invalid_input", error.message, [{ field, message: error.message }]);
    }
    throw error;
  }
}

/** The engine names its inputs with their units (temperatureK, frequenciesCm1[3]); the API's client sent these. */
function apiFieldOf(engineField: string): string {
  return engineField
    .replace(/^frequenciesCm1/, "frequencies")
    .replace(/^temperatureK$/, "temperature")
    .replace(/^pressurePa$/, "pressure")
    .replace(/^lowFrequency\.cutoffCm1$/, "lowFrequency.cutoff")
    .replace(/^(symbols|coordinates)/, "geometry.$1");
}

/** The page's inputs for an API field, so that an error appears beside the input it is about. */
const FORM_FIELD_OF: Array<[RegExp, string]> = [
  [/^frequencies/, "frequencies"],
  [/^geometry/, "xyz"],
  [/^lowFrequency\.cutoff$/, "cutoff"],
  [/^lowFrequency\.treatment$/, "treatment"],
  [/^(temperature|pressure|symmetryNumber|multiplicity|charge|frequencyScale|masses)$/, "$1"],
];
function formFieldOf(apiField: string | undefined): string {
  for (const [re, to] of FORM_FIELD_OF) if (apiField && re.test(apiField)) return apiField.replace(re, to).replace(/\[.*$/, "");
  return "form";
}

export type CalculatorResult = ReturnType<typeof runCalculator>;

/** The calculator page's form: text fields as people type them, read into the API's input. */
export const calculatorFormSchema = z.object({
  frequencies: z.string().min(1, "Paste the frequencies (cm⁻¹)"),
  xyz: z.string().optional().default(""),
  temperature: z.coerce.number({ message: "Enter a number" }),
  temperatureUnit: z.enum(["K", "C"]),
  standardState: z.enum(["1 atm", "1 bar", "1 M", "pressure"]),
  pressure: z.string().optional().default(""),
  symmetryNumber: z.coerce.number({ message: "Enter a whole number" }),
  multiplicity: z.coerce.number({ message: "Enter a whole number" }),
  charge: z.coerce.number({ message: "Enter a whole number" }).default(0),
  treatment: z.enum(["none", "grimme", "truhlar"]),
  cutoff: z.coerce.number({ message: "Enter a number" }),
  frequencyScale: z.coerce.number({ message: "Enter a number" }),
  masses: z.enum(["isotopic", "average"]),
});

export function runCalculatorForm(form: z.infer<typeof calculatorFormSchema>) {
  let frequencies: number[];
  let temperature: number;
  try {
    frequencies = parseFrequencyList(form.frequencies);
    temperature = convertTemperature(form.temperature, form.temperatureUnit, "K");
  } catch (error) {
    if (error instanceof ThermoInputError) {
      throw new ServiceError(422, "invalid_input", error.message, [{ field: error.field === "temperature" ? "temperature" : "frequencies", message: error.message }]);
    }
    throw error;
  }
  const pressure = form.standardState === "pressure" ? Number(form.pressure) : undefined;
  if (pressure !== undefined && !(pressure > 0)) {
    throw new ServiceError(422, "invalid_input", "Enter the pressure in Pa", [{ field: "pressure", message: "Enter a pressure above 0 Pa" }]);
  }
  try {
    return runCalculatorFromForm(form, frequencies, temperature, pressure);
  } catch (error) {
    if (error instanceof ServiceError) {
      const details = error.details.map((d) => ({ field: formFieldOf(d.field), message: d.message }));
      throw new ServiceError(error.status, error.code, error.message, details);
    }
    throw error;
  }
}

function runCalculatorFromForm(form: z.infer<typeof calculatorFormSchema>, frequencies: number[], temperature: number, pressure: number | undefined) {
  return runCalculator({
    frequencies,
    geometry: form.xyz.trim() ? { format: "xyz", data: form.xyz } : undefined,
    symmetryNumber: form.symmetryNumber,
    multiplicity: form.multiplicity,
    charge: form.charge,
    temperature,
    pressure,
    standardState: form.standardState === "pressure" ? undefined : form.standardState,
    lowFrequency: { treatment: form.treatment, cutoff: form.cutoff },
    frequencyScale: form.frequencyScale,
    masses: form.masses,
  });
}
