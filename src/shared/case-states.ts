// A support case's statuses and priorities with their labels, and where each status may go: zod-
// free, so pages that only show a case's state do not load the validation library.
export const CASE_STATUSES = ['new', 'in-progress', 'waiting', 'handed-off', 'resolved', 'closed'] as const;
export type CaseStatus = (typeof CASE_STATUSES)[number];

export const CASE_STATUS_LABELS: Record<CaseStatus, string> = {
  new: 'New',
  'in-progress': 'In progress',
  waiting: 'Waiting on customer',
  'handed-off': 'Handed off',
  resolved: 'Resolved',
  closed: 'Closed',
};

/** Still on someone's desk: what the queue and its counts show. */
export const OPEN_CASE_STATUSES: readonly CaseStatus[] = ['new', 'in-progress', 'waiting', 'handed-off'];

/**
 * Where a case may go from each status. Hand-off has its own action because it needs a person;
 * a resolved or closed case can be reopened.
 */
export const CASE_TRANSITIONS: Record<CaseStatus, readonly CaseStatus[]> = {
  new: ['in-progress', 'waiting', 'resolved', 'closed'],
  'in-progress': ['waiting', 'resolved', 'closed'],
  waiting: ['in-progress', 'resolved', 'closed'],
  'handed-off': ['in-progress', 'waiting', 'resolved', 'closed'],
  resolved: ['in-progress', 'closed'],
  closed: ['in-progress'],
};

export const CASE_PRIORITIES = ['low', 'normal', 'high', 'urgent'] as const;
export type CasePriority = (typeof CASE_PRIORITIES)[number];
export const CASE_PRIORITY_LABELS: Record<CasePriority, string> = { low: 'Low', normal: 'Normal', high: 'High', urgent: 'Urgent' };
