import assert from "node:assert/strict";
import fc from "fast-check";
import type { CampaignDto } from "@/db/queries/campaigns";
import { createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { createCampaign, dayFromToday } from "../factories-campaigns";
import { actionId, parseFlightResult, type ActionResult } from "./server-actions";

// Generated bad arguments for every server action in app/**/actions.ts (issue 7, "Bad input"), called as
// the browser calls them, by the workspace admin (allowed to call each). Shared by
// tests/actions/fuzz-actions.test.ts and the long soak script.

/** Each action: the page it is posted to, the file it lives in, and how many arguments it takes. */
export const ACTIONS = {
  inviteMemberAction: { page: "/settings", file: "settings/actions", arity: 1 },
  cancelInvitationAction: { page: "/settings", file: "settings/actions", arity: 1 },
  updateMemberRoleAction: { page: "/settings", file: "settings/actions", arity: 1 },
  removeMemberAction: { page: "/settings", file: "settings/actions", arity: 1 },
  createApiKeyAction: { page: "/settings", file: "settings/actions", arity: 1 },
  revokeApiKeyAction: { page: "/settings", file: "settings/actions", arity: 1 },
  updateWorkspaceAction: { page: "/settings", file: "settings/actions", arity: 1 },
  updateAlertRuleAction: { page: "/settings/alerts", file: "settings/alerts/actions", arity: 1 },
  createCampaignAction: { page: "/campaigns", file: "campaigns/actions", arity: 1 },
  moveCampaignAction: { page: "/campaigns", file: "campaigns/actions", arity: 2 },
} as const;
export type { ActionResult };
export type ActionName = keyof typeof ACTIONS;
export const ACTION_NAMES = Object.keys(ACTIONS) as ActionName[];

/** The action ids of the build in `distDir`, from its server-reference manifest. */
export function loadActionIds(distDir = process.env.NEXT_DIST_DIR ?? ".next"): Record<ActionName, string> {
  return Object.fromEntries(ACTION_NAMES.map((name) => [name, actionId(name, `${ACTIONS[name].file}.`, distDir)])) as Record<ActionName, string>;
}

export interface ActionFuzzWorld {
  appUrl: string;
  northwind: TestWorkspace;
  other: TestWorkspace;
  campaign: CampaignDto;
  foreign: CampaignDto;
  actionIds: Record<ActionName, string>;
}

export async function createActionFuzzWorld(appUrl: string, distDir?: string): Promise<ActionFuzzWorld> {
  const [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
  const campaign = await createCampaign(northwind, { startDate: dayFromToday(-10) });
  const foreign = await createCampaign(other, { startDate: dayFromToday(-10) });
  return { appUrl, northwind, other, campaign, foreign, actionIds: loadActionIds(distDir) };
}

export interface ActionCase {
  action: ActionName;
  /**
   * `json`: React's reply encoding of the arguments; `form`: one FormData argument, as a form submits it;
   * `raw`: a body no React client writes (references, broken JSON, too large), sent as it is.
   */
  encoding: "json" | "form" | "raw";
  args: unknown[];
  form?: [string, string][];
  raw?: { contentType: string; body: string };
}

function encodeLeaf(value: unknown): unknown {
  if (typeof value === "string") return value.startsWith("$") ? `$${value}` : value;
  if (typeof value === "number") {
    if (Number.isNaN(value)) return "$NaN";
    if (value === Infinity) return "$Infinity";
    if (value === -Infinity) return "$-Infinity";
    return Object.is(value, -0) ? "$-0" : value;
  }
  return value === undefined ? "$undefined" : value;
}

/**
 * The arguments as React's encodeReply writes plain values: `$` escaped as `$$`, and markers for what JSON
 * lacks. Copied without recursion: the generated inputs nest thousands of levels deep.
 */
export function encodeReply(args: unknown[]): string {
  const root: unknown[] = [];
  const pending: [source: unknown, target: Record<string, unknown> | unknown[]][] = [[args, root]];
  while (pending.length > 0) {
    const [source, target] = pending.pop()!;
    for (const [key, value] of Object.entries(source as object)) {
      let copy: unknown = encodeLeaf(value);
      if (value && typeof value === "object") {
        copy = Array.isArray(value) ? [] : {};
        pending.push([value, copy as Record<string, unknown>]);
      }
      (target as Record<string, unknown>)[key] = copy;
    }
  }
  return JSON.stringify(root);
}

/** Bodies a browser never sends: reply references to rows that do not exist, broken JSON, a body over the limit. */
const rawBody: fc.Arbitrary<{ contentType: string; body: string }> = fc.oneof(
  fc
    .tuple(fc.constantFrom("$", "$1", "$@1", "$Q0", "$W2", "$h1", "$T", "$K", "$nabc", "$F1", "$B1", "$S", "$i1", "$l1", "$Z"), fc.string({ maxLength: 8 }))
    .map(([marker, tail]) => ({ contentType: "text/plain;charset=UTF-8", body: JSON.stringify([{ memberId: marker + tail }, marker]) })),
  fc.constantFrom("", "[", "{}", "null", '"text"', "[1,", "\u0000", "[\"$1\"]").map((body) => ({ contentType: "text/plain;charset=UTF-8", body })),
  fc.integer({ min: 1_048_577, max: 1_200_000 }).map((length) => ({ contentType: "text/plain;charset=UTF-8", body: JSON.stringify(["x".repeat(length)]) })),
  fc.constantFrom("--x\r\nContent-Disposition: form-data; name=\"0\"\r\n\r\n[\"$1\"]\r\n--x--\r\n", "--x\r\nbroken", "--x\r\nContent-Disposition: form-data; name=\"0\"\r\n\r\nnot json\r\n--x--\r\n").map((body) => ({ contentType: "multipart/form-data; boundary=x", body })),
);

const hugeText = fc.integer({ min: 200, max: 70_000 }).map((length) => "x".repeat(length));

/** Values of the wrong type, out of range or naming nothing of ours. */
function badValue(world: ActionFuzzWorld): fc.Arbitrary<unknown> {
  return fc.oneof(
    fc.constantFrom<unknown>(null, true, false, 0, -1, 1.5, 1e308, -1e308, "", " ", "\u0000", "🙂", "<script>", "=1+1", [], [1], {}, { $: 1 }, "not-a-uuid", "00000000-0000-0000-0000-000000000000"),
    fc.constantFrom<unknown>(world.foreign.id, world.foreign.slug, world.other.id),
    hugeText,
    fc.string({ maxLength: 20, unit: "grapheme" }),
    fc.integer(),
    fc.double(),
  );
}

/** A valid-looking input per action, broken in one field below, so nothing generated can succeed. */
function inputShape(name: ActionName): string[] {
  switch (name) {
    case "inviteMemberAction":
      return ["email", "role"];
    case "cancelInvitationAction":
      return ["invitationId"];
    case "updateMemberRoleAction":
      return ["memberId", "role"];
    case "removeMemberAction":
      return ["memberId"];
    case "createApiKeyAction":
      return ["name", "permissions"];
    case "revokeApiKeyAction":
      return ["keyId"];
    case "updateWorkspaceAction":
      return ["name", "timeZone"];
    case "updateAlertRuleAction":
      return ["calls", "defaultRecipientRoles", "extraRecipients", "dailyDigest"];
    case "createCampaignAction":
      return ["name", "hypothesis", "metric", "baselineRate", "minimumLift", "alpha", "power", "sides", "arms", "startDate", "maxDays", "dailyUnits"];
    case "moveCampaignAction":
      return ["status"];
  }
}

/** Bad values in any fields, one field always longer than any limit: no generated input is valid, so no call may write. */
function badObject(world: ActionFuzzWorld, name: ActionName): fc.Arbitrary<Record<string, unknown>> {
  const fields = inputShape(name);
  const values = fc.record(Object.fromEntries(fields.map((field) => [field, badValue(world)])), { requiredKeys: [] });
  const tooLong = fc.tuple(fc.constantFrom(...fields), fc.integer({ min: 7_000, max: 70_000 }));
  return fc.tuple(values, tooLong).map(([object, [field, length]]) => ({ ...object, [field]: "x".repeat(length) }));
}

export function actionArbitraries(world: ActionFuzzWorld) {
  const perAction = ACTION_NAMES.map((action) => {
    const shapeless = fc.oneof(badValue(world), fc.array(badValue(world), { maxLength: 3 }), fc.integer({ min: 50, max: 3_000 }).map((depth) => JSON.parse("[".repeat(depth) + "]".repeat(depth)) as unknown));
    const input = fc.oneof({ arbitrary: badObject(world, action), weight: 3 }, { arbitrary: shapeless, weight: 1 });
    const json: fc.Arbitrary<ActionCase> =
      action === "moveCampaignAction"
        ? fc.tuple(fc.oneof(badValue(world), fc.constant(world.campaign.id)), badValue(world)).map(([id, status]) => ({ action, encoding: "json", args: [id, status] }))
        : fc.tuple(input, fc.array(badValue(world), { maxLength: 2 })).map(([first, extra]) => ({ action, encoding: "json", args: [first, ...extra] }));
    const form: fc.Arbitrary<ActionCase> = fc
      .array(fc.tuple(fc.oneof(fc.constantFrom(...inputShape(action)), fc.string({ maxLength: 10 })), fc.oneof(badValue(world).map((value) => (typeof value === "string" ? value : JSON.stringify(value) ?? "")), hugeText)), { maxLength: 6 })
      .map((entries) => ({ action, encoding: "form", args: [], form: entries }));
    const raw: fc.Arbitrary<ActionCase> = rawBody.map((body) => ({ action, encoding: "raw", args: [], raw: body }));
    return fc.oneof({ arbitrary: json, weight: 3 }, { arbitrary: form, weight: 1 }, { arbitrary: raw, weight: 1 });
  });
  return { actionCase: fc.oneof(...perAction) };
}

/** Posts one generated call as the admin: a JSON argument list, or one FormData argument (`$K1` plus `1_<field>` parts). */
export async function sendActionCase(world: ActionFuzzWorld, testCase: ActionCase): Promise<Response> {
  const headers: Record<string, string> = { "next-action": world.actionIds[testCase.action], accept: "text/x-component" };
  let body: BodyInit;
  if (testCase.encoding === "form") {
    const form = new FormData();
    form.append("0", JSON.stringify(["$K1"]));
    for (const [name, value] of testCase.form ?? []) form.append(`1_${name}`, value);
    body = form;
  } else if (testCase.encoding === "raw" && testCase.raw) {
    headers["content-type"] = testCase.raw.contentType;
    body = testCase.raw.body;
  } else {
    headers["content-type"] = "text/plain;charset=UTF-8";
    body = encodeReply(testCase.args);
  }
  return world.northwind.admin.client.fetch(ACTIONS[testCase.action].page, { method: "POST", headers, body });
}

/**
 * Calls the action with a generated bad input and checks the answer: the action's own `{ ok: false,
 * error }` (with `fieldErrors`, when given, as lists of messages), or a handled 4xx; never a 5xx.
 * @returns the status
 */
export async function checkActionCase(world: ActionFuzzWorld, testCase: ActionCase): Promise<number> {
  const response = await sendActionCase(world, testCase);
  const text = await response.text();
  const context = `${testCase.action} ${response.status}: ${text.slice(0, 300)}`;
  assert.ok(response.status < 500, `expected no 5xx, got ${context}`);
  if (testCase.encoding === "raw") {
    assert.ok(response.status === 400 || response.status === 413, `a malformed call was not refused: ${context}`);
    assert.match(response.headers.get("content-type") ?? "", /application\/problem\+json/, `not a problem document: ${context}`);
    return response.status;
  }
  if (response.status >= 400) return response.status;
  assert.match(response.headers.get("content-type") ?? "", /text\/x-component/, `not an action answer: ${context}`);
  const result = parseFlightResult(text);
  assert.ok(result, `no action result: ${context}`);
  assert.equal(result.ok, false, `a bad input was accepted: ${context}`);
  if (result.ok) return response.status;
  assert.ok(typeof result.error === "string" && result.error.length > 0, `no error message: ${context}`);
  for (const [field, messages] of Object.entries(result.fieldErrors ?? {})) {
    assert.ok(messages === undefined || (Array.isArray(messages) && messages.every((message) => typeof message === "string" && message.length > 0)), `bad fieldErrors.${field}: ${context}`);
  }
  return response.status;
}
