import Handlebars from "handlebars";
import { sendMail } from "./transport";

const layout = Handlebars.compile(`<!doctype html>
<html><body style="font-family: system-ui, sans-serif; color: #1c2a33; background: #f6f7f4; padding: 24px;">
<div style="max-width: 560px; margin: 0 auto; background: #ffffff; border: 1px solid #dfe3dc; border-radius: 8px; padding: 24px;">
<p style="font-weight: 600; color: #2f5d50; margin: 0 0 16px;">Peeksafe</p>
<h1 style="font-size: 18px; margin: 0 0 12px;">{{title}}</h1>
<p style="line-height: 1.5;">{{body}}</p>
<p><a href="{{url}}" style="display: inline-block; background: #2f5d50; color: #ffffff; padding: 10px 16px; border-radius: 6px; text-decoration: none;">{{action}}</a></p>
<p style="font-size: 12px; color: #5b6b73;">Or paste this address into your browser: {{url}}</p>
<p style="font-size: 12px; color: #5b6b73;">{{footer}}</p>
</div></body></html>`);

const plain = Handlebars.compile(`{{title}}

{{body}}

{{action}}: {{url}}

{{footer}}
`, { noEscape: true });

interface AccountMail {
  to: string;
  subject: string;
  title: string;
  body: string;
  action: string;
  url: string;
  footer: string;
}

async function sendAccountMail(mail: AccountMail): Promise<void> {
  await sendMail({ to: mail.to, subject: mail.subject, html: layout(mail), text: plain(mail) });
}

export function sendVerificationMail(to: string, url: string): Promise<void> {
  return sendAccountMail({
    to,
    url,
    subject: "Confirm your e-mail for Peeksafe",
    title: "Confirm your e-mail address",
    body: "Confirm this address to finish setting up your Peeksafe account.",
    action: "Confirm e-mail",
    footer: "If you did not create an account, ignore this message.",
  });
}

export function sendPasswordResetMail(to: string, url: string): Promise<void> {
  return sendAccountMail({
    to,
    url,
    subject: "Reset your Peeksafe password",
    title: "Choose a new password",
    body: "Someone asked to reset the password of this account. The link works once and expires in one hour.",
    action: "Choose a new password",
    footer: "If it was not you, ignore this message: your password stays as it is.",
  });
}

export function sendInvitationMail(input: {
  to: string;
  inviter: string;
  workspace: string;
  role: string;
  url: string;
}): Promise<void> {
  return sendAccountMail({
    to: input.to,
    url: input.url,
    subject: `${input.inviter} invited you to ${input.workspace} on Peeksafe`,
    title: `Join ${input.workspace}`,
    body: `${input.inviter} invited you to the ${input.workspace} workspace as ${input.role}.`,
    action: "Open the invitation",
    footer: "The invitation expires in 7 days. Sign in or create an account with this e-mail address to accept it.",
  });
}
