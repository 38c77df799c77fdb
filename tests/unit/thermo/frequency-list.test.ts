import { describe, expect, it } from "vitest";
import { parseFrequencyList, ThermoInputError } from "../../../app/domain/thermo";

describe("parseFrequencyList", () => {
  it.each([
    ["one per line", "1595.2\n3657.1\n3755.9", [1595.2, 3657.1, 3755.9]],
    ["commas and spaces", "1595.2, 3657.1 3755.9", [1595.2, 3657.1, 3755.9]],
    ["tabs, semicolons and CRLF", "-412.3;\t88.1\r\n1200", [-412.3, 88.1, 1200]],
    ["a Unicode minus marks an imaginary mode", "\u2212512.7 33.5", [-512.7, 33.5]],
    ["scientific notation", "1.5e3 2E2", [1500, 200]],
  ])("reads %s", (_, text, expected) => {
    expect(parseFrequencyList(text)).toEqual(expected);
  });

  it("refuses a token that is not a number and says which one", () => {
    expect(() => parseFrequencyList("100 12O 300")).toThrow(/Frequency 2 \(“12O”\)/);
    expect(() => parseFrequencyList("100 12O 300")).toThrow(ThermoInputError);
  });

  it("refuses a zero frequency (a translation or rotation left in)", () => {
    expect(() => parseFrequencyList("0 100")).toThrow(/zero/);
  });
});
