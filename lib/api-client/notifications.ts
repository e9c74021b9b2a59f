"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { call } from "./index";

export interface NotificationItem {
  id: string;
  projectId: string | null;
  kind: string;
  message: string;
  link: string;
  readAt: string | null;
  createdAt: string;
}

export const notificationKeys = { all: ["notifications"] as const, unread: ["notifications", "unread"] as const };

/** The unread count for the header, refreshed every minute and when the window regains focus. */
export function useUnreadCount(initial: number) {
  return useQuery({
    queryKey: notificationKeys.unread,
    queryFn: async () => (await call<{ unread: number }>("/api/v1/notifications?limit=0")).unread,
    initialData: initial,
    refetchInterval: 60_000,
  });
}

export function useNotifications(initial: { notifications: NotificationItem[]; unread: number }) {
  return useQuery({
    queryKey: notificationKeys.all,
    queryFn: () => call<{ notifications: NotificationItem[]; unread: number }>("/api/v1/notifications?limit=100"),
    initialData: initial,
  });
}

export function useMarkRead() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (input: { ids: string[] } | { all: true }) => call<{ marked: number; unread: number }>("/api/v1/notifications/read", { method: "POST", body: JSON.stringify(input) }),
    onSuccess: (out) => {
      client.setQueryData(notificationKeys.unread, out.unread);
      void client.invalidateQueries({ queryKey: notificationKeys.all });
    },
  });
}
