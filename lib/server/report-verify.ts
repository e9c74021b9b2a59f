/**
 * Is this file a report this deployment issued? The bytes' SHA-256 finds the issued record, and the
 * stored Ed25519 signature must check against the bytes with the key recorded at issue. One changed
 * byte changes the hash: no record, not valid.
 */
import { findReportsBySha256 } from "@/db/queries/reports";
import { sha256Hex, verifyBytes } from "./signing";

export interface VerifyAnswer {
  valid: boolean;
  reason?: string;
  report?: {
    code: string;
    project: string;
    revision: number;
    superseded: boolean;
    issuedAt: string;
    signers: { name: string; role: string; at: string }[];
    supersededAt: string | null;
    sha256: string;
    keyId: string;
  };
}

export async function verifyReportFile(bytes: Uint8Array): Promise<VerifyAnswer> {
  if (bytes.byteLength === 0) return { valid: false, reason: "The file is empty." };
  const sha256 = sha256Hex(bytes);
  const matches = await findReportsBySha256({ sha256 });
  if (matches.length === 0) {
    return {
      valid: false,
      reason: "This file does not match any report issued by this Airtally deployment: it was changed after it was issued (even one byte counts), or it was never issued here.",
    };
  }
  for (const { report, projectName } of matches) {
    if (!verifyBytes(bytes, Buffer.from(report.signature, "base64"), report.publicKeyPem)) continue;
    return {
      valid: true,
      ...(report.supersededBy ? { reason: "Genuine, but a later revision of this report has been issued since; ask for the current one." } : {}),
      report: {
        code: report.code,
        project: projectName,
        revision: report.revision,
        superseded: report.supersededBy !== null,
        issuedAt: report.issuedAt.toISOString(),
        signers: report.signers.map((s) => ({ name: s.name, role: s.role, at: s.at })),
        supersededAt: report.supersededAt?.toISOString() ?? null,
        sha256,
        keyId: report.keyId,
      },
    };
  }
  return { valid: false, reason: "A record with this file's fingerprint exists, but its signature does not check: the record is not trustworthy. Tell the deployment's administrator." };
}
