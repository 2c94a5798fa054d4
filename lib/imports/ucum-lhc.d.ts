// @lhncbc/ucum-lhc ships no types; this is the part of its API Tidemark uses
// (UcumLhcUtils.convertUnitTo, see source/ucumLhcUtils.js in the package).
declare module "@lhncbc/ucum-lhc" {
  export interface UcumConversion {
    status: "succeeded" | "failed" | "error";
    toVal: number | null;
    msg: string[];
  }
  export const UcumLhcUtils: {
    getInstance(): {
      convertUnitTo(
        from: string,
        value: number,
        to: string,
        options?: { molecularWeight?: number },
      ): UcumConversion;
    };
  };
}
