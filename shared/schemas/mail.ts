/** A message as the local mail catcher kept it (what admins read in the app). */
export type CaughtMessage = {
  id: string;
  receivedAt: string;
  from: string;
  to: string;
  subject: string;
  text: string;
  attachments: { filename: string; contentType: string; size: number }[];
};
