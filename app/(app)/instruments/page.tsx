import type { Metadata } from "next";
import Link from "next/link";
import { InstrumentTable } from "@/components/instruments/instrument-table";
import { buttonClasses } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { loadRegisterScreen, registerForClient } from "@/lib/server/instruments-screen";

export const metadata: Metadata = { title: "Instrument register" };

export default async function InstrumentsPage({ searchParams }: { searchParams: Promise<{ saved?: string; removed?: string }> }) {
  const { canEdit, units } = await loadRegisterScreen();
  const instruments = await registerForClient();
  const { saved, removed } = await searchParams;
  const overdue = instruments.filter((i) => i.retiredAt === null && i.calibrationStatus.status === "overdue").length;
  const dueSoon = instruments.filter((i) => i.retiredAt === null && i.calibrationStatus.status === "due-soon").length;

  return (
    <main className="mx-auto grid max-w-7xl gap-gutter px-gutter py-6">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1>Instrument register</h1>
          <p className="text-ink-soft">Every instrument the crews carry, shared by all projects. Readings name the instrument they were taken with.</p>
        </div>
        {canEdit && (
          <Link href="/instruments/new" className={buttonClasses("primary", "text-lg")}>
            Add an instrument
          </Link>
        )}
      </div>
      {saved && (
        <p role="status" className="rounded-card border-2 border-ok bg-ok-soft p-3 font-semibold">
          Saved {saved} in the register.
        </p>
      )}
      {removed && (
        <p role="status" className="rounded-card border-2 border-ok bg-ok-soft p-3 font-semibold">
          Deleted {removed} from the register.
        </p>
      )}
      {(overdue > 0 || dueSoon > 0) && (
        <p className="rounded-card border-2 border-caution bg-caution-soft p-3">
          {overdue > 0 && (
            <strong>
              {overdue} {overdue === 1 ? "instrument is" : "instruments are"} past the calibration due date.{" "}
            </strong>
          )}
          {dueSoon > 0 && (
            <>
              {dueSoon} {dueSoon === 1 ? "is" : "are"} due within 30 days.{" "}
            </>
          )}
          Readings taken with an instrument past its due date can be submitted only with a stated reason.
        </p>
      )}
      <Card>
        <InstrumentTable instruments={instruments} units={units} canEdit={canEdit} />
      </Card>
      {!canEdit && <p className="text-ink-soft">Technicians and site administrators keep the register; you can read it.</p>}
    </main>
  );
}
