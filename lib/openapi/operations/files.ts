import type { Operation } from "../registry";

const P = "/api/v1/projects/{projectId}";
const FILE_BODY = "multipart/form-data";

/** Photos, calibration certificates, and issued reports with their verification. */
export const fileOperations: Operation[] = [
  { method: "get", path: `${P}/sections/{sectionId}/photos`, tag: "Files", summary: "Photos of a traverse location (duct section), with file and thumbnail links", roles: "every member", responses: { "200": { description: "`{photos}`" } }, errors: [404] },
  {
    method: "post",
    path: `${P}/sections/{sectionId}/photos`,
    tag: "Files",
    summary: "Attach a photo of the traverse location",
    description: "Multipart: `file` (JPEG or PNG, at most 10 MB, typed from its bytes), optional `caption` and `traverseId`. Refused before it is read in full when larger.",
    roles: "technician",
    bodyContentType: FILE_BODY,
    responses: { "201": { description: "`{photo}`" } },
    errors: [400, 403, 404, 408, 413, 415],
  },
  { method: "get", path: `${P}/sections/{sectionId}/photos/{photoId}`, tag: "Files", summary: "The photo (`?thumb=1`: its thumbnail)", roles: "every member", query: { thumb: { description: "1: the thumbnail" } }, responses: { "200": { description: "The image.", contentType: "image/jpeg" } }, errors: [404] },
  { method: "delete", path: `${P}/sections/{sectionId}/photos/{photoId}`, tag: "Files", summary: "Remove a photo (its technician, while the section is not approved)", roles: "the technician who took it", responses: { "204": { description: "Removed." } }, errors: [403, 404, 409] },
  { method: "get", path: "/api/v1/instruments/{instrumentId}/certificate", tag: "Files", summary: "The instrument's current calibration certificate (`?thumb=1` for an image's thumbnail)", roles: "members of any project", query: { thumb: { description: "1: the thumbnail" } }, responses: { "200": { description: "The file.", contentType: "application/pdf" } }, errors: [403, 404] },
  {
    method: "post",
    path: "/api/v1/instruments/{instrumentId}/certificate",
    tag: "Files",
    summary: "Attach a calibration certificate (PDF, JPEG or PNG, at most 10 MB); it becomes the current one",
    roles: "technicians, engineers, site administrators",
    bodyContentType: FILE_BODY,
    responses: { "201": { description: "`{certificate}`" } },
    errors: [400, 403, 404, 408, 413, 415],
  },
  { method: "get", path: `${P}/reports`, tag: "Reports", summary: "Every issued revision of the closeout report, newest first", roles: "every member", responses: { "200": { description: "`{reports}`" } }, errors: [404] },
  { method: "get", path: `${P}/reports/latest.pdf`, tag: "Reports", summary: "The current issued closeout report (404 while none is issued)", roles: "every member", responses: { "200": { description: "The PDF, exactly as issued.", contentType: "application/pdf" } }, errors: [404] },
  { method: "get", path: `${P}/reports/{reportId}/pdf`, tag: "Reports", summary: "One issued revision's PDF", roles: "every member", responses: { "200": { description: "The PDF.", contentType: "application/pdf" } }, errors: [404] },
  { method: "get", path: `${P}/reports/{reportId}/signature`, tag: "Reports", summary: "One issued revision's Ed25519 signature (64 bytes) for offline checking", roles: "every member", responses: { "200": { description: "The raw signature.", contentType: "application/octet-stream" } }, errors: [404] },
  {
    method: "post",
    path: "/api/v1/reports/verify",
    tag: "Reports",
    summary: "Is this file a report this deployment issued?",
    description: "Multipart, field `file`. Answers `{valid, reason?, report?: {code, project, revision, superseded, issuedAt, signers: [{name, role, at}]}}`; one changed byte makes it `valid: false`.",
    signedIn: false,
    bodyContentType: FILE_BODY,
    responses: { "200": { description: "The verdict." } },
    errors: [400, 413, 415, 429],
  },
  { method: "get", path: "/api/v1/reports/public-key", tag: "Reports", summary: "The deployment's Ed25519 public key (PEM)", signedIn: false, responses: { "200": { description: "PEM.", contentType: "application/x-pem-file" } } },
  { method: "get", path: "/api/v1/reports/{code}/signature", tag: "Reports", summary: "The signature of the report issued under a verification code", signedIn: false, responses: { "200": { description: "The raw signature.", contentType: "application/octet-stream" } }, errors: [404] },
];
