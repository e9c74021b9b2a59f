"use client";

import { useMutation } from "@tanstack/react-query";
import { ApiError } from "./index";

export interface VerifyAnswer {
  valid: boolean;
  reason?: string;
  report?: { code: string; project: string; revision: number; superseded: boolean; issuedAt: string; signers: { name: string; role: string; at: string }[]; supersededAt?: string | null; sha256?: string };
}

/** Sends a file to the public verification endpoint. */
export function useVerifyReport() {
  return useMutation({
    mutationFn: async (file: File): Promise<VerifyAnswer> => {
      const form = new FormData();
      form.append("file", file);
      let res: Response;
      try {
        res = await fetch("/api/v1/reports/verify", { method: "POST", body: form });
      } catch {
        throw new ApiError(0, "The server cannot be reached. Check the connection and try again.");
      }
      const body = (await res.json().catch(() => null)) as (VerifyAnswer & { error?: { message: string } }) | null;
      if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? `The server answered ${res.status}.`);
      return body!;
    },
  });
}
