"use client";

import { useState } from "react";
import type { CertificateItem } from "@/lib/api-client/uploads";
import { UploadButton } from "./upload-button";

interface Props {
  instrumentId: string;
  serial: string;
  initial: CertificateItem | null;
  /** Technicians and site administrators keep the register; everyone else only downloads. */
  canAttach: boolean;
}

const KIND_WORDS: Record<string, string> = { "application/pdf": "PDF", "image/jpeg": "JPEG image", "image/png": "PNG image" };

function size(bytes: number): string {
  return bytes >= 1048576 ? `${(bytes / 1048576).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1024))} KB`;
}

/** The instrument's calibration certificate: what is on file, a download through our route, and the button that attaches a newer one. */
export function InstrumentCertificate({ instrumentId, serial, initial, canAttach }: Props) {
  const [current, setCurrent] = useState<CertificateItem | null>(initial);
  return (
    <div className="grid gap-3">
      {current ? (
        <div className="flex flex-wrap items-start gap-4">
          {current.thumbUrl && (
            <a href={current.url} target="_blank" rel="noopener" className="block overflow-hidden rounded-card border border-line bg-paper-sunk">
              {/* Served by our own route behind the session: the framework's image optimizer would fetch it without the cookie. */}
              {/* eslint-disable-next-line @next/next/no-img-element */}
              <img src={current.thumbUrl} alt={`Calibration certificate of ${serial}`} width={128} height={96} className="h-24 w-32 object-cover" />
            </a>
          )}
          <div className="grid min-w-0 flex-1 basis-64 gap-1">
            <p>
              <span className="font-semibold [overflow-wrap:anywhere]">{current.fileName || "Certificate"}</span>{" "}
              <span className="text-ink-soft">
                ({KIND_WORDS[current.contentType] ?? current.contentType}, <span className="num">{size(current.bytes)}</span>)
              </span>
            </p>
            <p className="text-sm text-ink-soft">
              Attached <span className="num">{current.createdAt.slice(0, 10)}</span>
              {current.uploadedByName ? ` by ${current.uploadedByName}` : ""}. A newer file replaces it as the current one; earlier ones stay on record.
            </p>
            <a href={current.url} download className="inline-flex min-h-touch items-center font-semibold text-accent-strong underline underline-offset-4">
              Download the certificate<span className="sr-only"> of {serial}</span>
            </a>
          </div>
        </div>
      ) : (
        <p className="text-ink-soft">No calibration certificate on file yet.{canAttach ? " Attach the laboratory's certificate (PDF, or a photo of it)." : ""}</p>
      )}
      {canAttach && (
        <UploadButton<{ certificate: CertificateItem }>
          url={`/api/v1/instruments/${instrumentId}/certificate`}
          label={current ? "Attach a newer certificate" : "Attach the certificate"}
          accept="application/pdf,image/jpeg,image/png"
          hint="PDF, JPEG or PNG, at most 10 MB."
          onUploaded={(answer) => setCurrent(answer.certificate)}
        />
      )}
    </div>
  );
}
