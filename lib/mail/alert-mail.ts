import { readFileSync } from "node:fs";
import Handlebars from "handlebars";
import { CALL_ASSUMPTIONS, CALL_WORDS } from "@/lib/alerts/call-words";
import { formatAbsolute, formatInterval, formatPValue, formatRelative } from "@/lib/alerts/format";
import type { AlertSnapshot } from "@/lib/alerts/snapshot";

function template(name: string, options: CompileOptions = {}) {
  return Handlebars.compile(readFileSync(new URL(`./templates/${name}`, import.meta.url), "utf8"), { strict: false, ...options });
}

type CompileOptions = Parameters<typeof Handlebars.compile>[1];

let compiled: { html: HandlebarsTemplateDelegate; text: HandlebarsTemplateDelegate } | undefined;
function templates() {
  compiled ??= { html: template("alert.html.hbs"), text: template("alert.txt.hbs", { noEscape: true }) };
  return compiled;
}

export interface AlertMailContent {
  subject: string;
  html: string;
  text: string;
}

/**
 * The alert e-mail of one change of call: the campaign, the call in words and what it means, the
 * lift with its always-valid confidence sequence, the always-valid p-value beside the naive one,
 * days run, a link to the campaign, the assumptions and (for members) an unsubscribe link.
 */
export function renderAlertMail(snapshot: AlertSnapshot, links: { campaignUrl: string; unsubscribeUrl: string | null }): AlertMailContent {
  const words = CALL_WORDS[snapshot.call];
  const absolute = (value: number | null) => formatAbsolute(value, snapshot);
  const arm = snapshot.leadingArmName && snapshot.leadingArm !== "treatment" ? ` (${snapshot.leadingArmName})` : "";
  const rows = [
    { label: `Lift${arm}, relative`, value: formatRelative(snapshot.liftRelative) },
    { label: "Always-valid confidence sequence, relative", value: formatInterval(snapshot.relativeSequence, formatRelative) },
    { label: `Lift${arm}, absolute`, value: absolute(snapshot.liftAbsolute) },
    { label: "Always-valid confidence sequence, absolute", value: formatInterval(snapshot.sequence, absolute) },
    { label: "Minimum lift worth having (planned, relative)", value: formatRelative(snapshot.minimumLift) },
    { label: "Always-valid p-value", value: formatPValue(snapshot.sequentialP) },
    { label: "Naive p-value (fixed-horizon test read today)", value: formatPValue(snapshot.fixedP) },
    { label: "Significance level", value: String(snapshot.significanceLevel) },
    { label: "Days run", value: `${snapshot.daysRun} of ${snapshot.maxDays}` },
  ];
  const data = {
    ...snapshot,
    phrase: words.phrase,
    action: words.action,
    meaning: words.meaning,
    fromPhrase: CALL_WORDS[snapshot.fromCall].phrase,
    rows,
    assumptions: CALL_ASSUMPTIONS,
    campaignUrl: links.campaignUrl,
    unsubscribeUrl: links.unsubscribeUrl,
  };
  return {
    subject: `${snapshot.campaignName}: ${words.phrase} — ${words.action}`,
    html: templates().html(data),
    text: templates().text(data).replace(/\n{3,}/g, "\n\n"),
  };
}

let digestTemplates: { html: HandlebarsTemplateDelegate; text: HandlebarsTemplateDelegate } | undefined;

export interface DigestCampaign {
  name: string;
  url: string;
  call: keyof typeof CALL_WORDS;
  daysRun: number | null;
  liftRelative: number | null;
  sequentialP: number | null;
  fixedP: number | null;
}

/** The daily digest: every running campaign of a workspace with its call in words and its numbers. */
export function renderDigestMail(input: { workspaceName: string; day: string; campaigns: DigestCampaign[] }): AlertMailContent {
  digestTemplates ??= { html: template("digest.html.hbs"), text: template("digest.txt.hbs", { noEscape: true }) };
  const data = {
    ...input,
    campaigns: input.campaigns.map((campaign) => ({
      name: campaign.name,
      url: campaign.url,
      phrase: CALL_WORDS[campaign.call].phrase,
      days: campaign.daysRun ?? 0,
      lift: formatRelative(campaign.liftRelative),
      sequentialP: formatPValue(campaign.sequentialP),
      fixedP: formatPValue(campaign.fixedP),
    })),
  };
  return {
    subject: `${input.workspaceName}: ${input.campaigns.length} running campaign${input.campaigns.length === 1 ? "" : "s"} on ${input.day}`,
    html: digestTemplates.html(data),
    text: digestTemplates.text(data),
  };
}
