import Link from "next/link";

/** Rendered with HTTP 403 by forbidden(): the user is signed in but their role does not allow this page. */
export default function Forbidden() {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <h1 className="text-2xl font-semibold">Not allowed</h1>
      <p className="mt-3 text-ink-muted">Your role in this team does not allow this page. A lead of the team can change your role.</p>
      <Link href="/scenarios" className="mt-6 inline-block text-signal underline">Back to scenarios</Link>
    </main>
  );
}
