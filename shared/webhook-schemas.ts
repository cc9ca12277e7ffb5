// Webhook registration (admin page and API): which URL is told about which events.
import { z } from "zod";
import { textField } from "./fields";

export const WEBHOOK_EVENTS = ["study.completed", "job.failed", "review.changed", "approval.stale", "profile.uploaded"] as const;
export type WebhookEvent = (typeof WEBHOOK_EVENTS)[number];

export const WEBHOOK_EVENT_LABELS: Record<WebhookEvent, string> = {
  "study.completed": "A study finished (saved, or as a job)",
  "job.failed": "A job failed",
  "review.changed": "A crossing's review moved (submitted, approved, returned, reopened)",
  "approval.stale": "An approval went stale (what it covered changed)",
  "profile.uploaded": "A load profile was uploaded",
};

export const webhookInputSchema = z.strictObject({
  url: z
    .string({ error: "Give the URL that receives the events." })
    .trim()
    .min(1, "Give the URL that receives the events.")
    .max(2000, "Keep the URL under 2,000 characters.")
    .describe("HTTPS URL (plain http only to this machine's loopback address on a local installation)"),
  events: z.array(z.enum(WEBHOOK_EVENTS, { error: `Events are ${WEBHOOK_EVENTS.join(", ")}.` })).min(1, "Choose at least one event."),
  description: textField(200).optional(),
});
export type WebhookInput = z.output<typeof webhookInputSchema>;
