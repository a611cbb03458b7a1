// Answers of the admin mail API (mail that has not gone out yet).

/** A mail queued over an hour ago and still not delivered. */
export interface LateMail {
  id: number;
  to: string;
  subject: string;
  attempts: number;
  lastError: string | null;
  queuedAt: string;
  nextAttemptAt: string;
}

export interface LateMailList {
  items: LateMail[];
  total: number;
}
