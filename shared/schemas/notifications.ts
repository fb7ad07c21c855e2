// In-app notifications: what the bell counts and its panel lists.
export const NOTIFICATION_KINDS = ['lot-rejected', 'awaiting-signature', 'ncr-opened', 'corrective-answered', 'calibration-due'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export type NotificationView = {
  id: number;
  kind: NotificationKind;
  title: string;
  /** A path inside the app: the record the notification is about. */
  link: string;
  createdAt: string;
  read: boolean;
};

export type NotificationsView = {
  data: NotificationView[];
  /** Unread notifications, counted up to UNREAD_COUNT_CAP (the bell shows "99+" beyond). */
  unread: number;
};

export const UNREAD_COUNT_CAP = 100;
