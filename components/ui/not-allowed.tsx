export function NotAllowed({ what }: { what: string }) {
  return (
    <main className="mx-auto max-w-7xl px-gutter py-6">
      <p role="alert" className="rounded-card border-2 border-fault bg-fault-soft p-4 font-semibold text-fault">
        Your role in this project does not include {what}. Ask the project administrator if you need it.
      </p>
    </main>
  );
}
