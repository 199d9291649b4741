import { describe, expect, it } from "vitest";
import { CODE_LENGTH, formatCode, newVerificationCode, normaliseCode } from "@/lib/cards/code";
import { findCodesInPdf } from "@/lib/cards/verify";

describe("verification codes", () => {
  it("are ten characters of Crockford's base-32 alphabet, without I, L, O or U", () => {
    for (let i = 0; i < 200; i += 1) {
      expect(newVerificationCode()).toMatch(/^[0-9A-HJKMNP-TV-Z]{10}$/);
    }
    expect(CODE_LENGTH).toBe(10);
  });

  it("do not repeat (50 random bits each)", () => {
    const codes = new Set(Array.from({ length: 2000 }, () => newVerificationCode()));
    expect(codes.size).toBe(2000);
  });

  it("are printed as two groups of five", () => {
    expect(formatCode("7KQ2M9XW4D")).toBe("7KQ2M-9XW4D");
  });

  it("read back as typed: any case, dashes and spaces, O for 0 and I or L for 1", () => {
    expect(normaliseCode("7kq2m-9xw4d")).toBe("7KQ2M9XW4D");
    expect(normaliseCode(" 7KQ2M 9XW4D ")).toBe("7KQ2M9XW4D");
    expect(normaliseCode("O1234-5678I")).toBe("0123456781");
    expect(normaliseCode("L0000-00000")).toBe("1000000000");
  });

  describe("edge cases", () => {
    it("refuse what cannot be one of ours", () => {
      for (const bad of ["", "ABC", "7KQ2M9XW4DX", "7KQ2M9XW4U", "7KQ2M/9XW4D", "../../etc"]) {
        expect(normaliseCode(bad), bad).toBeNull();
      }
    });

    it("are found in a PDF's document information written plainly, in UTF-16 or in hex", () => {
      const plain = Buffer.from("<< /Keywords (counterpoise-card 7KQ2M9XW4D job 1) >>", "latin1");
      expect(findCodesInPdf(plain)).toEqual(["7KQ2M9XW4D"]);
      const utf16 = Buffer.concat([
        Buffer.from("/Subject (\u00fe\u00ff", "latin1"),
        Buffer.from("Balance card verification code 7KQ2M-9XW4D", "utf16le").swap16(),
        Buffer.from(")", "latin1"),
      ]);
      expect(findCodesInPdf(utf16)).toEqual(["7KQ2M9XW4D"]);
      const hex = Buffer.from(
        `/Keywords <FEFF${Buffer.from("counterpoise-card 7KQ2M9XW4D", "utf16le").swap16().toString("hex")}>`,
        "latin1",
      );
      expect(findCodesInPdf(hex)).toEqual(["7KQ2M9XW4D"]);
      expect(findCodesInPdf(Buffer.from("%PDF-1.4 nothing here", "latin1"))).toEqual([]);
    });
  });
});
