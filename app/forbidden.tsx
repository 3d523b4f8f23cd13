import Link from "next/link";

export default function Forbidden() {
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-lg flex-col justify-center px-6 py-16">
      <p className="text-sm font-medium text-pine-700 dark:text-pine-300">Not for your role</p>
      <h1 className="mt-2 text-2xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">
        This screen needs another role
      </h1>
      <p className="mt-3 text-tremor-default text-tremor-content dark:text-dark-tremor-content">
        Your role in this workspace does not include this screen. An admin of the workspace can change roles in
        Settings.
      </p>
      <p className="mt-6 flex gap-4 text-tremor-default">
        <Link href="/campaigns" className="font-medium text-pine-700 underline underline-offset-4 dark:text-pine-300">
          Back to campaigns
        </Link>
        <Link href="/settings" className="font-medium text-pine-700 underline underline-offset-4 dark:text-pine-300">
          See your role
        </Link>
      </p>
    </main>
  );
}
