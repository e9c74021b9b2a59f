"use client";

import { useMutation } from "@tanstack/react-query";
import type { MemberRole } from "@/db/schema";
import { call } from "./index";

/** People actions; screens refresh their server-rendered data after each (router.refresh). */
export function usePeopleMutations(projectId: string) {
  const base = `/api/v1/projects/${projectId}`;
  return {
    invite: useMutation({ mutationFn: (input: { email: string; role: MemberRole }) => call<{ kind: "invitation" | "member" }>(`${base}/invitations`, { method: "POST", body: JSON.stringify(input) }) }),
    withdraw: useMutation({ mutationFn: (invitationId: string) => call<void>(`${base}/invitations/${invitationId}`, { method: "DELETE" }) }),
    changeRole: useMutation({ mutationFn: ({ userId, role }: { userId: string; role: MemberRole }) => call<unknown>(`${base}/members/${userId}`, { method: "PATCH", body: JSON.stringify({ role }) }) }),
    remove: useMutation({ mutationFn: (userId: string) => call<void>(`${base}/members/${userId}`, { method: "DELETE" }) }),
    designate: useMutation({
      mutationFn: (input: { userId: string; certifyingBody: string; certificateNumber: string }) => call<unknown>(`${base}/supervisor`, { method: "PUT", body: JSON.stringify(input) }),
    }),
    sign: useMutation({ mutationFn: (input: { password: string; confirm: true }) => call<unknown>(`${base}/supervisor/signature`, { method: "POST", body: JSON.stringify(input) }) }),
  };
}

export function acceptInvitation(token: string, input: { name: string; password: string }) {
  return call<{ userId: string; projectId: string; next: string }>(`/api/v1/invitations/${encodeURIComponent(token)}/accept`, { method: "POST", body: JSON.stringify(input) });
}
