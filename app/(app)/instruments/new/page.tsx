import type { Metadata } from "next";
import { InstrumentForm } from "@/components/instruments/instrument-form";
import { Card } from "@/components/ui/card";
import { NotAllowed } from "@/components/ui/not-allowed";
import { loadRegisterScreen } from "@/lib/server/instruments-screen";

export const metadata: Metadata = { title: "Add an instrument" };

export default async function NewInstrumentPage() {
  const { canEdit, units } = await loadRegisterScreen();
  if (!canEdit) return <NotAllowed what="changing the instrument register" />;
  return (
    <main className="mx-auto grid max-w-4xl gap-gutter px-gutter py-6">
      <h1>Add an instrument</h1>
      <Card>
        <InstrumentForm units={units} />
      </Card>
    </main>
  );
}
