import { defineRoute } from "@/lib/server/route";
import { getSigningKey } from "@/lib/server/signing";

export const dynamic = "force-dynamic";

/** Public: the deployment's Ed25519 public key (PEM), which checks every report it issues. */
export const GET = defineRoute({ outsideProject: "public" }, async () => {
  const key = getSigningKey();
  return new Response(key.publicKeyPem, {
    headers: {
      "content-type": "application/x-pem-file; charset=us-ascii",
      "content-disposition": 'inline; filename="airtally-public.pem"',
      "x-airtally-key-id": key.keyId,
    },
  });
});
