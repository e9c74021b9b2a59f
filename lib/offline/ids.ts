/**
 * Ids chosen on the device (for creates that must be safe to retry). `crypto.randomUUID` exists only
 * in secure contexts; a tablet reaching the server over plain http on a site network still gets a
 * version-4 UUID from `crypto.getRandomValues`, which every browser offers.
 */
export function newId(): string {
  if (typeof crypto !== "undefined" && typeof crypto.randomUUID === "function") return crypto.randomUUID();
  const b = new Uint8Array(16);
  crypto.getRandomValues(b);
  b[6] = (b[6]! & 0x0f) | 0x40; // version 4 (RFC 9562 §5.4)
  b[8] = (b[8]! & 0x3f) | 0x80; // variant 10
  const h = [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}
