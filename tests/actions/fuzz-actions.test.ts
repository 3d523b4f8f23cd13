import fc from "fast-check";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { dumpProductTables } from "../factories-campaigns";
import { ACTION_NAMES, actionArbitraries, checkActionCase, createActionFuzzWorld, sendActionCase, type ActionFuzzWorld } from "../helpers/action-arbitraries";
import { parseFlightResult } from "../helpers/server-actions";

// Generated bad arguments for every server action, called by the admin (issue 7, "Bad input"): the
// action's own { ok: false, error } or a handled 4xx, never a 5xx, and no product row written.
// Long form: `npm run soak:fuzz`.
const SEED = 20_260_703;
const RUNS = 300;

let world: ActionFuzzWorld;

beforeAll(async () => {
  world = await createActionFuzzWorld(inject("appUrl"));
}, 60_000);

describe("fuzzing every server action's input", () => {
  it(`answers ${RUNS} generated bad inputs with { ok: false } or a 4xx, writing nothing`, async () => {
    const before = await dumpProductTables([world.northwind.id, world.other.id]);
    const tried = new Map<string, number>();
    await fc.assert(
      fc.asyncProperty(actionArbitraries(world).actionCase, async (testCase) => {
        tried.set(testCase.action, (tried.get(testCase.action) ?? 0) + 1);
        await checkActionCase(world, testCase);
      }),
      { seed: SEED, numRuns: RUNS, endOnFailure: true },
    );
    expect(await dumpProductTables([world.northwind.id, world.other.id])).toBe(before);
    expect([...tried.keys()].sort()).toEqual([...ACTION_NAMES].sort());
  }, 120_000);

  // Found by `npm run soak:fuzz`: React's reply decoder threw on an unescaped "$1" and Next answered 500.
  it("refuses a call React's reply decoder cannot read with a 400 problem, and lets an escaped one reach the action", async () => {
    const refused = await sendActionCase(world, { action: "removeMemberAction", encoding: "raw", args: [], raw: { contentType: "text/plain;charset=UTF-8", body: '[{"memberId":"$1"}]' } });
    expect(refused.status).toBe(400);
    expect(await refused.json()).toMatchObject({ title: "Malformed action call", status: 400 });

    const escaped = await sendActionCase(world, { action: "removeMemberAction", encoding: "json", args: [{ memberId: "$1" }] });
    expect(escaped.status).toBe(200);
    expect(parseFlightResult(await escaped.text())).toMatchObject({ ok: false });
  });
});
