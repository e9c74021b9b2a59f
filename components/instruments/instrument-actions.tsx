"use client";

/** Retire an instrument (kept in the register for the readings that name it), return it to service, or delete an unused entry made in error. */
import { useRouter } from "next/navigation";
import { useState } from "react";
import { buttonClasses } from "@/components/ui/button";
import { useDeleteInstrument, useUpdateInstrument } from "@/lib/api-client/field";

export function InstrumentActions({ id, serial, retired, used }: { id: string; serial: string; retired: boolean; used: boolean }) {
  const router = useRouter();
  const update = useUpdateInstrument(id);
  const remove = useDeleteInstrument(id);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const error = update.error?.message ?? remove.error?.message;

  return (
    <div className="grid gap-3">
      <p className="text-ink-soft">
        {retired
          ? "Retired instruments stay in the register so earlier readings keep naming them; they cannot be picked for new readings."
          : "Retire an instrument that is lost, broken or sold. It stays in the register for the readings taken with it."}
      </p>
      <div className="flex flex-wrap gap-3">
        <button
          type="button"
          disabled={update.isPending}
          className={buttonClasses("secondary")}
          onClick={() =>
            update.mutate(
              { retired: !retired },
              {
                onSuccess: () => router.refresh(),
              },
            )
          }
        >
          {retired ? "Return to service" : "Retire this instrument"}
        </button>
        {!used &&
          (confirmDelete ? (
            <button
              type="button"
              disabled={remove.isPending}
              className={buttonClasses("primary", "bg-fault hover:bg-fault")}
              onClick={() => remove.mutate(undefined, { onSuccess: () => router.push(`/instruments?removed=${encodeURIComponent(serial)}`) })}
            >
              Yes, delete {serial}
            </button>
          ) : (
            <button type="button" className={buttonClasses("quiet")} onClick={() => setConfirmDelete(true)}>
              Delete this entry (made in error)
            </button>
          ))}
      </div>
      {error && (
        <p role="alert" className="font-semibold text-fault">
          {error}
        </p>
      )}
    </div>
  );
}
