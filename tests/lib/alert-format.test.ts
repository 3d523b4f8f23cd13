import { describe, expect, it } from "vitest";
import { CALLS } from "@/db/schema/campaigns";
import { CALL_ASSUMPTIONS, CALL_WORDS } from "@/lib/alerts/call-words";
import { formatAbsolute, formatInterval, formatPValue, formatRelative } from "@/lib/alerts/format";
import type { AlertSnapshot } from "@/lib/alerts/snapshot";
import { renderAlertMail } from "@/lib/mail/alert-mail";

const MINUS = "\u2212";

function snapshot(overrides: Partial<AlertSnapshot> = {}): AlertSnapshot {
  return {
    campaignName: "Trail shoe spring e-mail",
    metricKind: "conversion",
    metricName: "First purchase",
    metricUnit: null,
    call: "lift",
    fromCall: "collecting",
    day: "2026-03-09",
    daysRun: 9,
    maxDays: 28,
    leadingArm: "treatment",
    leadingArmName: "Spring e-mail",
    liftAbsolute: 0.0123,
    liftRelative: 0.246,
    sequence: [0.0041, 0.0205],
    relativeSequence: [0.082, 0.41],
    fixedInterval: [0.006, 0.0186],
    fixedP: 0.00004,
    sequentialP: 0.0123,
    significanceLevel: 0.05,
    minimumLift: 0.1,
    healthIssues: [],
    ...overrides,
  };
}

describe("call words", () => {
  it("gives every call a phrase, a what-to-do line and a meaning, each its own", () => {
    expect(Object.keys(CALL_WORDS).sort()).toEqual([...CALLS].sort());
    for (const call of CALLS) {
      const words = CALL_WORDS[call];
      expect(words.phrase.length, call).toBeGreaterThan(3);
      expect(words.action.length, call).toBeGreaterThan(3);
      expect(words.meaning.length, call).toBeGreaterThan(20);
    }
    expect(new Set(CALLS.map((call) => CALL_WORDS[call].phrase)).size).toBe(CALLS.length);
    expect(new Set(CALLS.map((call) => CALL_WORDS[call].action)).size).toBe(CALLS.length);
  });

  it.each(CALLS)("puts the words of %s in the subject, the text and the HTML of its alert", (call) => {
    const mail = renderAlertMail(snapshot({ call }), { campaignUrl: "http://127.0.0.1:3000/campaigns/c1", unsubscribeUrl: null });
    const { phrase, action, meaning } = CALL_WORDS[call];
    expect(mail.subject).toBe(`Trail shoe spring e-mail: ${phrase} — ${action}`);
    expect(mail.text).toContain(`${phrase}: ${action}`);
    expect(mail.text).toContain(meaning);
    for (const assumption of CALL_ASSUMPTIONS) expect(mail.text).toContain(assumption);
    expect(mail.html).toContain(phrase);
  });
});

describe("numbers in alerts", () => {
  it("formats p-values to four decimals, tiny ones as < 0.0001, missing ones in words", () => {
    expect(formatPValue(0.04321)).toBe("0.0432");
    expect(formatPValue(1)).toBe("1.0000");
    expect(formatPValue(0.0001)).toBe("0.0001");
    expect(formatPValue(0.00004)).toBe("< 0.0001");
    expect(formatPValue(null)).toBe("not estimable yet");
  });

  it("formats an absolute lift in percentage points for conversions, in the metric's unit for means", () => {
    expect(formatAbsolute(0.0123, { metricKind: "conversion", metricUnit: null })).toBe("+1.23 pp");
    expect(formatAbsolute(-0.005, { metricKind: "conversion", metricUnit: null })).toBe(`${MINUS}0.50 pp`);
    expect(formatAbsolute(0.4, { metricKind: "mean", metricUnit: "USD" })).toBe("+0.40 USD");
    expect(formatAbsolute(-1.234, { metricKind: "mean", metricUnit: null })).toBe(`${MINUS}1.23`);
    expect(formatAbsolute(null, { metricKind: "conversion", metricUnit: null })).toBe("open");
  });

  it("formats a relative lift in per cent with a sign, and a rounded zero without one", () => {
    expect(formatRelative(0.246)).toBe("+24.6 %");
    expect(formatRelative(-0.031)).toBe(`${MINUS}3.1 %`);
    expect(formatRelative(-0.00001)).toBe("0.0 %");
    expect(formatRelative(null)).toBe("open");
  });

  it("formats intervals end by end, open ends in words", () => {
    expect(formatInterval([0.082, 0.41], formatRelative)).toBe("+8.2 % to +41.0 %");
    expect(formatInterval([-0.02, null], formatRelative)).toBe(`${MINUS}2.0 % to open`);
    expect(formatInterval(null, formatRelative)).toBe("not estimable yet");
  });

  it("shows every number of the alert with its unit", () => {
    const { text } = renderAlertMail(snapshot(), { campaignUrl: "http://127.0.0.1:3000/campaigns/c1", unsubscribeUrl: "http://127.0.0.1:3000/unsubscribe?token=t" });
    // The only treatment arm goes unnamed; a leading arm of several is named.
    expect(text).toContain("Lift, relative: +24.6 %");
    expect(text).toContain("Always-valid confidence sequence, relative: +8.2 % to +41.0 %");
    expect(text).toContain("Lift, absolute: +1.23 pp");
    expect(text).toContain("Always-valid confidence sequence, absolute: +0.41 pp to +2.05 pp");
    expect(text).toContain("Always-valid p-value: 0.0123");
    expect(text).toContain("Naive p-value (fixed-horizon test read today): < 0.0001");
    expect(text).toContain("Days run: 9 of 28");
    expect(text).toContain("Stop alerts for this campaign: http://127.0.0.1:3000/unsubscribe?token=t");
    const mean = renderAlertMail(snapshot({ metricKind: "mean", metricUnit: "USD", liftAbsolute: 0.4, sequence: [0.1, null] }), { campaignUrl: "x", unsubscribeUrl: null });
    expect(mean.text).toContain("absolute: +0.40 USD");
    expect(mean.text).toContain("absolute: +0.10 USD to open");
    expect(mean.text).not.toContain("Stop alerts");
    const threeArm = renderAlertMail(snapshot({ leadingArm: "variant-b", leadingArmName: "Push at six" }), { campaignUrl: "x", unsubscribeUrl: null });
    expect(threeArm.text).toContain("Lift (Push at six), relative: +24.6 %");
  });
});
