import type { Status } from "../audit/types.js";

/** How a status is shown: always a word and a marker, never colour alone. */
export interface StatusView {
  readonly status: Status;
  readonly label: string;
  readonly marker: string;
  /** Sort order, 0 (not compared) to 3 (discrepant). */
  readonly rank: number;
}

const VIEWS: Readonly<Record<Status, StatusView>> = {
  consistent: { status: "consistent", label: "consistent", marker: "\u25cb", rank: 1 },
  tension: { status: "tension", label: "tension", marker: "\u25b3", rank: 2 },
  discrepant: { status: "discrepant", label: "discrepant", marker: "\u25a0", rank: 3 },
  "not-compared": { status: "not-compared", label: "not compared", marker: "\u2013", rank: 0 },
};

export function statusView(status: Status): StatusView {
  return VIEWS[status];
}
