import { beforeEach, describe, expect, it } from "vitest";
import type { DB } from "@/db/client";
import type { User } from "@/db/users";
import { HttpError } from "@/lib/http/errors";
import { changeUser } from "@/lib/users/manage";
import { addTestUser, freshDb, testEngine } from "../helpers/db";

// Two owners, and each is taken away at the same moment by the other (one demoted, one
// disabled). On PostgreSQL (`npm run test:pg`) the two changes run side by side on the pool's
// connections; on SQLite the app's one connection takes them in turn. Either way the shop must
// keep exactly one active owner: one change goes through, the other is refused as the last one.

let db: DB;
let first: User;
let second: User;

beforeEach(async () => {
  db = await freshDb();
  first = await addTestUser(db, "owner");
  second = await addTestUser(db, "owner");
});

async function activeOwners(): Promise<number> {
  const row = await db
    .selectFrom("users")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .where("role", "=", "owner")
    .where("disabled", "=", 0)
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

function outcome(result: PromiseSettledResult<User>): string {
  if (result.status === "fulfilled") return "changed";
  const error: unknown = result.reason;
  return error instanceof HttpError ? `${error.status} ${error.code}` : String(error);
}

describe(`the last active owner, with two changes at once (${testEngine()})`, () => {
  it("lets one of two owners go and refuses the other with 409 last_owner", async () => {
    const results = await Promise.allSettled([
      changeUser(db, first.id, { role: "counter" }, second),
      changeUser(db, second.id, { disabled: true }, first),
    ]);
    expect(results.map(outcome).sort()).toEqual(["409 last_owner", "changed"]);
    expect(await activeOwners()).toBe(1);
  });

  it("keeps one owner round after round, whichever change arrives first", async () => {
    for (let round = 0; round < 4; round++) {
      db = await freshDb();
      const owners = [await addTestUser(db, "owner"), await addTestUser(db, "owner")];
      const [a, b] = round % 2 === 0 ? owners : [owners[1]!, owners[0]!];
      const results = await Promise.allSettled([
        changeUser(db, a!.id, { disabled: true }, b!),
        changeUser(db, b!.id, { role: "machinist" }, a!),
      ]);
      expect(results.map(outcome).sort()).toEqual(["409 last_owner", "changed"]);
      expect(await activeOwners()).toBe(1);
    }
  });
});
