import { getSubscriptionCampaign } from "@/db/queries/subscriptions";
import { verifyUnsubscribeToken } from "@/lib/unsubscribe-token";

export const dynamic = "force-dynamic";

export const metadata = { title: "Stop alerts" };

/** Unsubscribe without signing in: the signed token names the person and the campaign; a button confirms (mail scanners only GET). */
export default async function UnsubscribePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const token = typeof params.token === "string" ? params.token : null;
  const claim = verifyUnsubscribeToken(token);
  const campaign = claim ? await getSubscriptionCampaign(claim.campaignId) : null;
  const done = params.done === "1";
  return (
    <main className="mx-auto max-w-lg px-6 py-16">
      <p className="mb-6 font-semibold text-pine-700">Peeksafe</p>
      {!claim || !campaign ? (
        <section aria-labelledby="invalid">
          <h1 id="invalid" className="text-xl font-semibold text-slate-900">This link does not work</h1>
          <p className="mt-3 text-slate-700">
            The unsubscribe link is incomplete or was changed. Open the campaign in Peeksafe to manage your alerts, or use the link of a
            more recent alert e-mail.
          </p>
        </section>
      ) : done ? (
        <section aria-labelledby="done">
          <h1 id="done" className="text-xl font-semibold text-slate-900">Alerts stopped</h1>
          <p className="mt-3 text-slate-700">
            You will get no more alert e-mails for <strong>{campaign.name}</strong>. You can subscribe again from the campaign page.
          </p>
        </section>
      ) : (
        <section aria-labelledby="confirm">
          <h1 id="confirm" className="text-xl font-semibold text-slate-900">Stop alerts for {campaign.name}?</h1>
          <p className="mt-3 text-slate-700">You will no longer get e-mails when this campaign&apos;s call changes. Other campaigns are not affected.</p>
          <form method="post" action="/unsubscribe/confirm" className="mt-6">
            <input type="hidden" name="token" value={token!} />
            <button type="submit" className="rounded-md bg-pine-700 px-4 py-2 font-medium text-white hover:bg-pine-800 focus:outline-none focus-visible:ring-2 focus-visible:ring-pine-500">
              Stop alerts for this campaign
            </button>
          </form>
        </section>
      )}
    </main>
  );
}
