import { describe, expect, test } from "vitest";
import { escapeXml, formatProfileValue, niceTicks, profileStatesOf, renderProfileSvg } from "~/components/profile-svg";
import { niceStep, tickDecimals } from "~/components/chart-scale";

const states = [
  { label: "A + B", kind: "minimum" as const, value: 0 },
  { label: "TS1", kind: "transition-state" as const, value: 21.34 },
  { label: "C <1>", kind: "minimum" as const, value: -12.5 },
];

describe("energy-profile SVG", () => {
  test("is one SVG document with every state, its value in the unit, and the TS marked", () => {
    const svg = renderProfileSvg(states, { unit: "kcal/mol", title: "Test & profile" });
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg.trim().endsWith("</svg>")).toBe(true);
    expect(svg).toContain("21.3");
    expect(svg).toContain("−12.5");
    expect(svg).toContain("ΔG / kcal/mol");
    expect(svg).toContain('data-kind="transition-state"');
    expect(svg.match(/data-state=/g)).toHaveLength(3);
    // Labels are escaped (a label may hold < or &).
    expect(svg).toContain("C &lt;1&gt;");
    expect(svg).toContain("Test &amp; profile");
    // Dashed connectors between the two pairs of neighbours.
    expect(svg.match(/stroke-dasharray="4 3"/g)).toHaveLength(2);
  });

  test("a lower value is drawn lower (SVG y grows downwards)", () => {
    const svg = renderProfileSvg(states, { unit: "kcal/mol" });
    const y = (label: string) => {
      const line = svg.split("\n").find((l) => l.includes(`data-state="${escapeXml(label)}"`))!;
      return Number(/ y1="([\d.]+)"/.exec(line)![1]);
    };
    expect(y("TS1")).toBeLessThan(y("A + B"));
    expect(y("C <1>")).toBeGreaterThan(y("A + B"));
  });

  test("a state without a value is left out and said so; a comparison series adds a legend", () => {
    const svg = renderProfileSvg([states[0]!, { ...states[1]!, value: null }], { unit: "eV", compare: { name: "other protocol", states } });
    expect(svg).toContain("not computed");
    expect(svg).toContain("other protocol");
    expect(svg).toContain("ΔG / eV");
  });

  test("profileStatesOf draws G when every state has it, else E", () => {
    const s = [
      { label: "a", kind: "minimum" as const, relativeE: 0, relativeG: 0 },
      { label: "b", kind: "minimum" as const, relativeE: 3, relativeG: null },
    ];
    expect(profileStatesOf(s).quantity).toBe("ΔE");
    expect(profileStatesOf(s).states[1]!.value).toBe(3);
    expect(profileStatesOf([s[0]!]).quantity).toBe("ΔG");
  });

  test("ticks are round numbers covering the range", () => {
    // A span of 36 in about 6 steps is 6 per step, rounded up to the next 1–2–5 step: 10.
    expect(niceTicks(-13, 23, 6)).toEqual([-10, 0, 10, 20]);
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(formatProfileValue(-0.04, 1)).toBe("0.0");
    expect(formatProfileValue(-3.25, 1)).toBe("−3.3");
  });
});

describe("chart scale", () => {
  // Round steps of 1, 2 or 5 × 10ⁿ (common practice for axis ticks).
  test.each([
    [0.3, 0.5],
    [3.7, 5],
    [12, 20],
    [0.011, 0.02],
  ])("the step at or above %s is %s", (raw, step) => {
    expect(niceStep(raw)).toBeCloseTo(step, 12);
  });
  test.each([
    [0.05, 2],
    [0.5, 1],
    [20, 0],
  ])("a step of %s shows %s decimals", (step, decimals) => {
    expect(tickDecimals(step)).toBe(decimals);
  });
});
