import { useState } from "react";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/tools-thermo";
import { FormError } from "~/components/forms";
import { ModeEntropyChart } from "~/components/mode-entropy-chart";
import { EnergyUnitSelect, formatEnergy, UNIT_LABEL, type DisplayEnergyUnit } from "~/components/energy-format";
import { calculatorFormSchema, runCalculatorForm } from "~/services/calculator.server";
import { convertTemperature } from "~/domain/thermo/units";
import { requireUser } from "~/utils/guards.server";
import { parseForm, ServiceError, serviceErrorToFields } from "~/utils/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Thermochemistry calculator · Thermotally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request);
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  await requireUser(request);
  const parsed = parseForm(await request.formData(), calculatorFormSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, result: null }, { status: 422 });
  try {
    return { errors: {} as Record<string, string>, result: runCalculatorForm(parsed.data) };
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error), result: null }, { status: 422 });
    throw error;
  }
}

// An example of our own: water at a hybrid-DFT-like harmonic level (from memory, rounded).
const EXAMPLE = {
  frequencies: "1638.2\n3812.5\n3917.9",
  xyz: "3\nwater, example\nO   0.000000   0.000000   0.117300\nH   0.000000   0.757200  -0.469200\nH   0.000000  -0.757200  -0.469200",
  symmetryNumber: "2",
};

export default function ThermoCalculator({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const result = actionData?.result ?? null;
  const busy = useNavigation().state !== "idle";
  const [unit, setUnit] = useState<DisplayEnergyUnit>("kcal/mol");
  const [example, setExample] = useState<typeof EXAMPLE | null>(null);
  const [standardState, setStandardState] = useState("1 atm");
  const key = example ? "example" : "blank";

  const err = (name: string) => (errors[name] ? <p className="field-error" role="alert">{errors[name]}</p> : null);

  return (
    <main className="mx-auto grid max-w-[1400px] gap-5 px-4 py-6 lg:grid-cols-[420px_1fr]">
      {/* Units and symbols keep their case (kJ, σ, cm⁻¹): labels here are not upper-cased. */}
      <Form method="post" className="card space-y-3 self-start [&_.label]:normal-case [&_.label]:tracking-normal" noValidate key={key}>
        <div className="flex items-baseline justify-between">
          <h1 className="text-lg font-bold">Thermochemistry calculator</h1>
          <button type="button" className="link text-xs" onClick={() => setExample(EXAMPLE)}>
            Fill in an example
          </button>
        </div>
        <p className="text-xs text-muted">Ideal gas, rigid rotor, harmonic oscillator, from harmonic frequencies and a geometry.</p>
        <FormError error={errors.form} />
        <div>
          <label className="label" htmlFor="frequencies">Frequencies (cm⁻¹; imaginary as negative)</label>
          <textarea id="frequencies" name="frequencies" rows={5} className="input font-mono" defaultValue={example?.frequencies} placeholder={"one per line, or separated by commas or spaces"} />
          {err("frequencies")}
        </div>
        <div>
          <label className="label" htmlFor="xyz">Geometry (XYZ, Å)</label>
          <textarea id="xyz" name="xyz" rows={6} className="input font-mono text-xs" defaultValue={example?.xyz} placeholder={"3\ncomment\nO 0.0 0.0 0.117\n…"} />
          {err("xyz")}
        </div>
        <div className="grid grid-cols-2 gap-3">
          <div>
            <label className="label" htmlFor="temperature">Temperature</label>
            <div className="flex gap-1">
              <input id="temperature" name="temperature" className="input" defaultValue="298.15" inputMode="decimal" />
              <select name="temperatureUnit" className="input w-20" aria-label="Temperature unit" defaultValue="K">
                <option value="K">K</option>
                <option value="C">°C</option>
              </select>
            </div>
            {err("temperature")}
          </div>
          <div>
            <label className="label" htmlFor="standardState">Standard state</label>
            <select id="standardState" name="standardState" className="input" value={standardState} onChange={(e) => setStandardState(e.target.value)}>
              <option value="1 atm">gas, 1 atm</option>
              <option value="1 bar">gas, 1 bar</option>
              <option value="1 M">solution, 1 mol/L</option>
              <option value="pressure">gas, other pressure</option>
            </select>
          </div>
          {standardState === "pressure" ? (
            <div className="col-span-2">
              <label className="label" htmlFor="pressure">Pressure (Pa)</label>
              <input id="pressure" name="pressure" className="input" defaultValue="101325" inputMode="decimal" />
              {err("pressure")}
            </div>
          ) : null}
          <div>
            <label className="label" htmlFor="symmetryNumber">Symmetry number σ</label>
            <input id="symmetryNumber" name="symmetryNumber" className="input" defaultValue={example?.symmetryNumber ?? "1"} inputMode="numeric" />
            {err("symmetryNumber")}
          </div>
          <div>
            <label className="label" htmlFor="multiplicity">Multiplicity</label>
            <input id="multiplicity" name="multiplicity" className="input" defaultValue="1" inputMode="numeric" />
            {err("multiplicity")}
          </div>
          <div>
            <label className="label" htmlFor="charge">Charge</label>
            <input id="charge" name="charge" className="input" defaultValue="0" inputMode="numeric" />
            {err("charge")}
          </div>
          <div>
            <label className="label" htmlFor="frequencyScale">Frequency scale factor</label>
            <input id="frequencyScale" name="frequencyScale" className="input" defaultValue="1" inputMode="decimal" />
            {err("frequencyScale")}
          </div>
          <div className="col-span-2 grid grid-cols-[1fr_7rem] gap-3">
            <div>
              <label className="label" htmlFor="treatment">Low-frequency modes</label>
              <select id="treatment" name="treatment" className="input" defaultValue="grimme">
                <option value="none">harmonic (no treatment)</option>
                <option value="grimme">quasi-RRHO (Grimme 2012)</option>
                <option value="truhlar">raised to cutoff (Truhlar 2011)</option>
              </select>
              {err("treatment")}
            </div>
            <div>
              <label className="label" htmlFor="cutoff">Cutoff (cm⁻¹)</label>
              <input id="cutoff" name="cutoff" className="input" defaultValue="100" inputMode="decimal" />
              {err("cutoff")}
            </div>
          </div>
          <div className="col-span-2">
            <label className="label" htmlFor="masses">Atomic masses</label>
            <select id="masses" name="masses" className="input" defaultValue="isotopic">
              <option value="isotopic">most abundant isotope</option>
              <option value="average">standard atomic weights</option>
            </select>
            {err("masses")}
          </div>
        </div>
        <button type="submit" className="btn-primary" disabled={busy}>
          {busy ? "Computing…" : "Compute"}
        </button>
      </Form>

      <section className="min-w-0 space-y-4">
        {!result ? (
          <div className="card text-muted">Results appear here: ZPE, enthalpy and free-energy corrections, entropy, and what each degree of freedom contributes.</div>
        ) : (
          <>
            <div className="card">
              <div className="mb-3 flex flex-wrap items-center gap-3">
                <h2 className="mr-auto font-bold">
                  Corrections at <span className="num">{result.temperature}</span> K (<span className="num">{convertTemperature(result.temperature, "K", "C").toFixed(2)}</span> °C), {result.standardState.name}
                </h2>
                <EnergyUnitSelect value={unit} onChange={setUnit} />
              </div>
              <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5" data-testid="calculator-results">
                {[
                  ["ZPE", formatEnergy(result.zpe, unit), UNIT_LABEL[unit]],
                  ["H(T) − H(0)", formatEnergy(result.thermalEnergy, unit), UNIT_LABEL[unit]],
                  ["H correction", formatEnergy(result.enthalpyCorrection, unit), UNIT_LABEL[unit]],
                  ["G correction", formatEnergy(result.gibbsCorrection, unit), UNIT_LABEL[unit]],
                  ["S", result.entropy.toFixed(2), "J mol⁻¹ K⁻¹"],
                ].map(([label, value, unitLabel]) => (
                  <div key={label} className="rounded-md border border-rule/60 bg-paper px-3 py-2">
                    <dt className="text-xs font-medium text-muted">{label}</dt>
                    <dd className="num text-right text-lg font-bold">{value}</dd>
                    <dd className="text-right text-xs text-muted">{unitLabel}</dd>
                  </div>
                ))}
              </dl>
              <p className="mt-3 text-xs text-muted">
                {result.standardState.description} {result.lowFrequency.description} Masses: {result.masses === "isotopic" ? "most abundant isotopes" : "standard atomic weights"}; scale factor {result.frequencyScale}; σ = {result.symmetryNumber}; {result.atom ? "atom" : result.linear ? "linear" : "non-linear"}.
              </p>
              {result.imaginaryFrequencies.length ? (
                <p className="mt-2 text-sm text-warn" data-testid="imaginary">
                  Left out as imaginary: {result.imaginaryFrequencies.map((f) => `${withMinusSign(f)} cm⁻¹`).join(", ")}
                </p>
              ) : null}
              {result.warnings.map((w) => (
                <p key={w} className="mt-1 text-sm text-warn">{w}</p>
              ))}
            </div>
            <div className="card">
              <h2 className="mb-2 font-bold">Contributions</h2>
              <table className="table [&_th]:normal-case [&_th]:tracking-normal" data-testid="contributions">
                <thead>
                  <tr>
                    <th>Degree of freedom</th>
                    <th className="text-right">Thermal energy ({UNIT_LABEL[unit]})</th>
                    <th className="text-right">S (J mol⁻¹ K⁻¹)</th>
                  </tr>
                </thead>
                <tbody>
                  {CONTRIBUTIONS.map(([k, label]) => (
                    <tr key={k}>
                      <td>{label}</td>
                      <td className="num text-right">{formatEnergy(result.contributions[k].energy, unit)}</td>
                      <td className="num text-right">{result.contributions[k].entropy.toFixed(2)}</td>
                    </tr>
                  ))}
                  <tr className="font-bold">
                    <td>Total (H(T) − H(0) includes pV = kT)</td>
                    <td className="num text-right">{formatEnergy(result.thermalEnergy, unit)}</td>
                    <td className="num text-right">{result.entropy.toFixed(2)}</td>
                  </tr>
                </tbody>
              </table>
              <p className="mt-2 text-xs text-muted">
                Principal moments (u Å²): <span className="num">{result.principalMoments.map((m) => m.toFixed(4)).join(", ")}</span>. Vibrational energy excludes the ZPE.
              </p>
            </div>
            {result.perMode ? (
              <div className="card">
                <h2 className="mb-2 font-bold">Entropy per mode</h2>
                <ModeEntropyChart frequencies={result.perMode.frequenciesCm1} entropy={result.perMode.entropy} cutoff={result.lowFrequency.cutoff} />
              </div>
            ) : null}
            <p className="text-xs text-muted">{result.model}</p>
          </>
        )}
      </section>
    </main>
  );
}

const CONTRIBUTIONS = [
  ["translational", "Translational"],
  ["rotational", "Rotational"],
  ["vibrational", "Vibrational"],
  ["electronic", "Electronic"],
] as const;

// The frequency as entered, unrounded, with a real minus sign.
const withMinusSign = (v: number) => String(v).replace(/^-/, "−");
