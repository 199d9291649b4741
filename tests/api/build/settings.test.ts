import { beforeEach, describe, expect, it } from "vitest";
import { GET, PUT } from "@/app/api/settings/build/route";
import { listAuditEntries } from "@/db/audit";
import type { DB } from "@/db/client";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { EMPTY_BUILD_SETTINGS } from "@/lib/build-record/settings-schema";
import { addOneOfEachRole, freshDb } from "../../helpers/db";
import { jsonRequest, noParams } from "../../helpers/http";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  signInAs(users.owner);
});

const SETTINGS = {
  ...EMPTY_BUILD_SETTINGS,
  ringFactors: [
    { maker: "Example rings (replace)", position: "top", use: "street", factor: ".0045" },
  ],
  minCoilBindMargin: "0.060",
  clearancePerInch: { min: "0.00075", max: "0.0010" },
  camCheckLift: "0.050",
};

const put = (settings: unknown, version: number) =>
  PUT(jsonRequest("PUT", "/api/settings/build", { version, settings }), noParams);

describe("/api/settings/build", () => {
  it("starts empty (no maker's table built in), saves with the version read, audited", async () => {
    const first = (await (await GET(jsonRequest("GET", "/x"), noParams)).json()) as {
      settings: unknown;
      version: number;
    };
    expect(first).toEqual({ settings: EMPTY_BUILD_SETTINGS, version: 0 });
    const res = await put(SETTINGS, 0);
    expect(res.status).toBe(200);
    const saved = (await res.json()) as { settings: typeof SETTINGS; version: number };
    expect(saved.version).toBe(1);
    expect(saved.settings.ringFactors[0]!.factor).toBe("0.0045");
    expect(await listAuditEntries(db, "build_settings", 1)).toHaveLength(1);
  });

  it("refuses a factor typed as a percentage, by field (422)", async () => {
    const res = await put(
      { ...SETTINGS, ringFactors: [{ ...SETTINGS.ringFactors[0], factor: "4.5" }] },
      0,
    );
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(Object.keys(error.fields)).toEqual(["settings.ringFactors.0.factor"]);
  });

  it("only the owner saves them (403 for the machinist); a customer cannot read them", async () => {
    signInAs(users.machinist);
    expect((await put(SETTINGS, 0)).status).toBe(403);
    signInAs(users.customer);
    expect((await GET(jsonRequest("GET", "/x"), noParams)).status).toBe(403);
  });

  it("a save based on an older version is refused (409)", async () => {
    expect((await put(SETTINGS, 0)).status).toBe(200);
    expect((await put({ ...SETTINGS, camCheckLift: "0.040" }, 0)).status).toBe(409);
  });
});
