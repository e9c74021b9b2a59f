import crypto from "node:crypto";

// Crockford's base32: no I, L, O or U, so a code read aloud or typed from paper is not misread.
const ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";

/** A short verification code, 12 characters (60 random bits) in groups of four: "7KQ2-M9XD-4RTP". */
export function newVerificationCode(): string {
  const bytes = crypto.randomBytes(12);
  const chars = [...bytes].map((b) => ALPHABET[b & 31]);
  return `${chars.slice(0, 4).join("")}-${chars.slice(4, 8).join("")}-${chars.slice(8, 12).join("")}`;
}

/** A typed code in canonical form, or null when it cannot be one (case, spaces, dashes and look-alikes forgiven). */
export function normaliseVerificationCode(input: string): string | null {
  if (input.length > 40) return null;
  const raw = input
    .toUpperCase()
    .replace(/[\s-]/g, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1");
  if (!/^[0-9A-HJKMNP-TV-Z]{12}$/.test(raw)) return null;
  return `${raw.slice(0, 4)}-${raw.slice(4, 8)}-${raw.slice(8, 12)}`;
}
