import { all, create, type FactoryFunctionMap } from "mathjs";
import { beforeEach, describe, expect, it } from "vitest";
import { POST as postHole } from "@/app/api/balance/hole/route";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

// Reference library: mathjs with BigNumber arithmetic, 1 in = 25.4 mm exactly.
const math = create(all as FactoryFunctionMap, { number: "BigNumber", precision: 64 });

let users: Record<Role, User>;

beforeEach(async () => {
  users = await addOneOfEachRole(await freshDb());
  signInAs(users.machinist);
});

async function hole(body: unknown) {
  const res = await postHole(jsonRequest("POST", "/api/balance/hole", body), noParams);
  return { status: res.status, body: await res.json() };
}

describe("POST /api/balance/hole: drill sizes as written", () => {
  it("reads 3/8 as 9.525 mm and answers the depth for that diameter", async () => {
    const inch = await hole({ kind: "drill", mass: "5", diameter: "3/8", density: "7.85" });
    const mm = await hole({ kind: "drill", mass: "5", diameter: "9.525", density: "7.85" });
    expect(inch.status).toBe(200);
    expect(inch.body.drill).toMatchObject({
      diameterMm: math.evaluate("3/8 inch").toNumeric("mm").toString(),
      entered: '3/8"',
      unit: "in",
    });
    expect(inch.body.tipDepth).toBe(mm.body.tipDepth);
    // Hand check (geometry): V = 5 / 7.85 × 1000 = 636.943 mm³, πr² = π × 4.7625² = 71.2557 mm²,
    // h = 4.7625 × cot 59° = 2.86160 mm; T = 636.943 / 71.2557 + 2 × 2.86160 / 3 = 8.93882 + 1.90773 = 10.8466 mm.
    expect(Number(inch.body.tipDepth)).toBeCloseTo(10.8466, 3);
  });

  it("keeps a bare number as millimetres, as before", async () => {
    const res = await hole({ kind: "drill", mass: "5", diameter: "10", density: "7.85" });
    expect(res.status).toBe(200);
    // Worked by hand: 5 g of steel with a 10 mm drill, T = 10.1127 mm.
    expect(Number(res.body.tipDepth)).toBeCloseTo(10.112675, 5);
    expect(res.body.fits).toBeNull();
  });

  it("reads number and letter sizes (#21 = 0.1590 in, F = 0.257 in, ASME B94.11M)", async () => {
    const n21 = await hole({ kind: "drill", mass: "1", diameter: "#21", density: "7.85" });
    expect(n21.body.drill.diameterMm).toBe(math.evaluate("0.1590 inch").toNumeric("mm").toString());
    const f = await hole({ kind: "drill", mass: "1", diameter: "F", density: "7.85" });
    expect(f.body.drill.diameterMm).toBe(math.evaluate("0.257 inch").toNumeric("mm").toString());
  });

  it("says whether the hole fits the metal there is", async () => {
    const deep = { kind: "drill", mass: "5", diameter: "10", density: "7.85" };
    expect((await hole({ ...deep, availableDepth: "12" })).body.fits).toBe(true);
    expect((await hole({ ...deep, availableDepth: "9" })).body.fits).toBe(false);
  });

  it("refuses a size it cannot read with 422 naming diameter", async () => {
    const res = await hole({ kind: "drill", mass: "5", diameter: "3/8x", density: "7.85" });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(["diameter"]);
    expect(res.body.error.fields.diameter).toMatch(/3\/8/);
  });

  it("refuses a point angle of 180° or more with 422 naming pointAngle", async () => {
    const res = await hole({
      kind: "drill",
      mass: "5",
      diameter: "10",
      density: "7.85",
      pointAngle: "200",
    });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(["pointAngle"]);
  });
});

describe("POST /api/balance/hole: heavy-metal plug", () => {
  it("counts the empty cone of a 118° point under a flat-ended ½ in plug", async () => {
    const body = {
      kind: "plug",
      diameter: '1/2"',
      length: "25",
      plugDensity: "18.0",
      hostDensity: "7.85",
    };
    const flat = await hole(body);
    const pointed = await hole({ ...body, pointAngle: "118" });
    expect(pointed.status).toBe(200);
    // Worked by hand: r = 6.35 mm, h = 6.35 × cot 59° = 3.81546 mm, cone = π × 40.3225 × 3.81546 / 3
    // = 161.110 mm³, × 7.85 g/cm³ = 1.2647 g that the flat plug does not put back.
    expect(Number(flat.body.netMass)).toBeCloseTo(32.1443, 4);
    expect(Number(pointed.body.netMass)).toBeCloseTo(30.8795, 4);
    expect(Number(pointed.body.pointVoidMass)).toBeCloseTo(1.2647, 4);
    expect(pointed.body.drill.entered).toBe('1/2"');
  });
});

describe("POST /api/balance/hole: split and moved corrections", () => {
  it("splits over two holes at ±θ and refuses 90° with 422 naming halfAngleDeg", async () => {
    // m / (2 cos 60°) = 10 / 1 = 10 g each (geometry).
    expect((await hole({ kind: "split", mass: "10", halfAngleDeg: "60" })).body.massEach).toBe(
      "10",
    );
    const res = await hole({ kind: "split", mass: "10", halfAngleDeg: "90" });
    expect(res.status).toBe(422);
    expect(Object.keys(res.body.error.fields)).toEqual(["halfAngleDeg"]);
  });

  it("moves a correction to another radius: 12 g at 50 mm = 8 g at 75 mm", async () => {
    // m₂ = m₁ r₁ / r₂ = 12 × 50 / 75 = 8 g (geometry).
    expect(
      (await hole({ kind: "move", mass: "12", fromRadius: "50", toRadius: "75" })).body,
    ).toEqual({ mass: "8", unbalance: "600" });
  });
});

describe("POST /api/balance/hole: figures typed in the job's ounces and inches", () => {
  it("moves 1 oz at 3 in to 2 in: 1.5 oz, 3 oz·in, answered in g and g·mm", async () => {
    const res = await hole({
      kind: "move",
      massUnit: "oz",
      lengthUnit: "in",
      mass: "1",
      fromRadius: "3",
      toRadius: "2",
    });
    expect(res.status).toBe(200);
    // By hand: 1 oz × 3 in / 2 in = 1.5 oz = 1.5 × 28.349523125 = 42.5242846875 g;
    // 3 oz·in = 3 × 720.077887375 = 2160.233662125 g·mm (NIST SP 811 exact factors).
    expect(res.body).toEqual({ mass: "42.5242846875", unbalance: "2160.233662125" });
    expect(res.body.mass).toBe(math.evaluate("1.5 oz").toNumeric("g").toString());
  });

  it("splits 0.5 oz over two holes at ±30° as the same grams", async () => {
    const oz = await hole({ kind: "split", massUnit: "oz", mass: "0.5", halfAngleDeg: "30" });
    expect(oz.status).toBe(200);
    // By hand: 0.5 oz = 14.1747615625 g (exact); in both holes 14.1747615625 / cos 30°
    // = 16.36763 g, each 14.1747615625 / (2 cos 30°) = 14.1747615625 / 1.7320508 = 8.18381 g.
    expect(Number(oz.body.massEach)).toBeCloseTo(8.18381, 4);
    expect(Number(oz.body.totalMass)).toBeCloseTo(16.36763, 4);
  });

  it("takes the mass in ounces and the metal there is in inches for a drill depth", async () => {
    const inches = await hole({
      kind: "drill",
      massUnit: "oz",
      lengthUnit: "in",
      mass: "0.25",
      diameter: "3/8",
      density: "7.85",
      availableDepth: "0.5",
    });
    expect(inches.status).toBe(200);
    // By hand: 0.25 oz = 7.08738078125 g; 7.08738 g / 7.85 g/cm³ = 902.85 mm³; / (π × 4.7625²) = 12.6706 mm + 2/3 × 2.8616
    // = 14.578 mm at the tip: deeper than 0.5 in = 12.7 mm of metal.
    expect(Number(inches.body.tipDepth)).toBeCloseTo(14.578, 2);
    expect(inches.body).toMatchObject({ availableDepth: "12.7", fits: false });
  });

  it("takes a plug length in inches", async () => {
    const base = { kind: "plug", diameter: '1/2"', plugDensity: "18.0", hostDensity: "7.85" };
    const inches = await hole({ ...base, lengthUnit: "in", length: "1" });
    const mm = await hole({ ...base, length: "25.4" });
    expect(inches.body).toEqual(mm.body);
  });

  it("refuses a unit it does not know with 422 naming the field", async () => {
    const res = await hole({
      kind: "move",
      massUnit: "lb",
      mass: "1",
      fromRadius: "3",
      toRadius: "2",
    });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toEqual({ massUnit: "Weights in: grams or ounces." });
  });
});
