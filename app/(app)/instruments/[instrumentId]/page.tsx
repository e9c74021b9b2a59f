import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { CalibrationStatus } from "@/components/instruments/calibration-status";
import { InstrumentActions } from "@/components/instruments/instrument-actions";
import { InstrumentForm } from "@/components/instruments/instrument-form";
import { Card } from "@/components/ui/card";
import { InstrumentCertificate } from "@/components/uploads/instrument-certificate";
import { formatAccuracy, formatRange } from "@/lib/instruments/units";
import { formatCalendarDate } from "@/lib/instruments/usability";
import { currentCertificateForClient } from "@/lib/server/certificates";
import { instrumentForClient, loadRegisterScreen } from "@/lib/server/instruments-screen";

export const metadata: Metadata = { title: "Instrument" };

export default async function InstrumentPage({ params }: { params: Promise<{ instrumentId: string }> }) {
  const { canEdit, units } = await loadRegisterScreen();
  const instrument = await instrumentForClient((await params).instrumentId);
  if (!instrument) notFound();
  const certificate = await currentCertificateForClient({ instrumentId: instrument.id });
  const used = instrument.usage.traverses + instrument.usage.terminalReadings;

  return (
    <main className="mx-auto grid max-w-4xl gap-gutter px-gutter py-6">
      <div>
        <h1>{instrument.name}</h1>
        <div className="mt-2">
          <CalibrationStatus usability={instrument.calibrationStatus} />
        </div>
        <p className="mt-2 text-ink-soft">
          {used === 0
            ? "Not used for any reading yet."
            : `Used for ${instrument.usage.traverses} traverse${instrument.usage.traverses === 1 ? "" : "s"} and ${instrument.usage.terminalReadings} terminal reading${instrument.usage.terminalReadings === 1 ? "" : "s"}${instrument.usage.lastUsedAt ? `, last on ${formatCalendarDate(instrument.usage.lastUsedAt.slice(0, 10))}` : ""}.`}
        </p>
      </div>
      {canEdit ? (
        <Card title="Details">
          <InstrumentForm units={units} instrument={instrument} kindLocked={used > 0} />
        </Card>
      ) : (
        <Card title="Details">
          <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[auto_1fr]">
            <dt className="font-semibold">Serial</dt>
            <dd className="num">{instrument.serial}</dd>
            <dt className="font-semibold">Calibrated</dt>
            <dd className="num">{instrument.calibratedOn ? formatCalendarDate(instrument.calibratedOn) : "—"}</dd>
            <dt className="font-semibold">Calibration due</dt>
            <dd className="num">{instrument.calibrationDueOn ? formatCalendarDate(instrument.calibrationDueOn) : "—"}</dd>
            <dt className="font-semibold">Certificate</dt>
            <dd>{instrument.certificateNumber || "—"}</dd>
            <dt className="font-semibold">Range</dt>
            <dd className="num">{formatRange(instrument, units)}</dd>
            <dt className="font-semibold">Accuracy</dt>
            <dd className="num">{formatAccuracy(instrument, units)}</dd>
            {instrument.probeCoefficient !== null && (
              <>
                <dt className="font-semibold">Pitot coefficient</dt>
                <dd className="num">{instrument.probeCoefficient}</dd>
              </>
            )}
            {instrument.hoodCorrectionFactor !== null && (
              <>
                <dt className="font-semibold">Hood correction factor</dt>
                <dd className="num">{instrument.hoodCorrectionFactor}</dd>
              </>
            )}
            <dt className="font-semibold">Notes</dt>
            <dd>{instrument.notes || "—"}</dd>
          </dl>
        </Card>
      )}
      <Card title="Calibration certificate">
        <InstrumentCertificate instrumentId={instrument.id} serial={instrument.serial} initial={certificate} canAttach={canEdit} />
      </Card>
      {canEdit && (
        <Card title={instrument.retiredAt ? "Retired" : "Take out of service"}>
          <InstrumentActions id={instrument.id} serial={instrument.serial} retired={instrument.retiredAt !== null} used={used > 0} />
        </Card>
      )}
    </main>
  );
}
