import { describe, it, expect } from "vitest";
import { InputError } from "../src/errors.js";

describe("InputError", () => {
  it("names the file, key and pixel in its message", () => {
    const e = new InputError("expected a positive number, found -1", { file: "a.yaml", key: "psf.fwhmArcsec" });
    expect(e.message).toBe("a.yaml, key psf.fwhmArcsec: expected a positive number, found -1");
  });
});

describe("pixels in messages", () => {
  it("say which number is the column and that both count from 0", () => {
    const e = new InputError("expected a finite value, found NaN", { file: "image.fits", pixel: [3, 1] });
    expect(e.message).toBe("image.fits, pixel (3, 1) (column, row, counted from 0): expected a finite value, found NaN");
    expect(e.bareMessage).toBe("expected a finite value, found NaN");
  });
});
