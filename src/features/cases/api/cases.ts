// Case, notice and outbox endpoints: key factory, fetchers and hooks. Mutations answer with the
// whole case, which replaces the cached one, so the timeline is always the server's.
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CaseDetail, CaseList, CasePerson, CaseStatus, NoticeView, OutboxList, OutboxMessage, SummaryPreview } from '@/shared/schemas/cases';
import { api } from '@/lib/api-client';

export interface CaseFilters {
  status?: string;
  assignee?: string;
  site?: string;
  age?: string;
  q?: string;
  sort?: string;
  dir?: 'asc' | 'desc';
  page?: number;
  pageSize?: number;
}

export const caseKeys = {
  all: ['cases'] as const,
  list: (f: CaseFilters) => [...caseKeys.all, 'list', f] as const,
  detail: (id: number) => [...caseKeys.all, 'detail', id] as const,
  people: () => [...caseKeys.all, 'people'] as const,
  summary: (id: number, walkId: number | null) => [...caseKeys.all, 'summary', id, walkId] as const,
  notices: () => ['notices'] as const,
  outbox: (f: Record<string, unknown>) => ['outbox', 'list', f] as const,
  outboxMessage: (id: number) => ['outbox', 'message', id] as const,
};

function query(f: Record<string, unknown>): string {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(f)) if (v !== undefined && v !== '' && v !== null) p.set(k, String(v));
  return p.toString();
}

export function useCases(f: CaseFilters, opts: { poll?: boolean } = {}) {
  return useQuery({
    queryKey: caseKeys.list(f),
    queryFn: () => api<CaseList>(`/api/cases?${query({ ...f })}`),
    placeholderData: keepPreviousData,
    refetchInterval: opts.poll ? 30_000 : false,
  });
}

export function useCase(id: number) {
  return useQuery({
    queryKey: caseKeys.detail(id),
    queryFn: () => api<{ case: CaseDetail }>(`/api/cases/${id}`).then((r) => r.case),
    enabled: id > 0,
    // Walks move on in the runner and colleagues add notes: the case is read fresh each visit,
    // and followed while a walk for it is still open.
    staleTime: 0,
    refetchInterval: (q) => (q.state.data?.walks.some((w) => w.status === 'open') ? 5000 : false),
  });
}

export function useCasePeople() {
  return useQuery({ queryKey: caseKeys.people(), queryFn: () => api<{ people: CasePerson[] }>('/api/cases/people').then((r) => r.people), staleTime: 300_000 });
}

function useCaseMutation<V>(fn: (v: V) => Promise<{ case: CaseDetail }>, opts: { inline?: boolean } = {}) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: V) => fn(v).then((r) => r.case),
    onSuccess: (c) => {
      qc.setQueryData(caseKeys.detail(c.id), c);
      qc.invalidateQueries({ queryKey: [...caseKeys.all, 'list'] });
    },
    meta: opts.inline ? { inlineErrors: true } : undefined,
  });
}

export type NewCase = {
  callerName: string;
  callerCompany: string;
  callerPhone: string;
  callerEmail: string;
  site: string;
  line: string;
  applicator: string;
  applicatorId: number | null;
  symptom: string;
  priority: string;
};

export function useCreateCase() {
  return useCaseMutation((b: NewCase) => api<{ case: CaseDetail }>('/api/cases', { method: 'POST', body: b }), { inline: true });
}

export function useUpdateCase(id: number) {
  return useCaseMutation((b: Record<string, unknown>) => api<{ case: CaseDetail }>(`/api/cases/${id}`, { method: 'PATCH', body: b }), { inline: true });
}

export function useSetCaseStatus(id: number) {
  return useCaseMutation((b: { status: CaseStatus; note?: string }) => api<{ case: CaseDetail }>(`/api/cases/${id}/status`, { method: 'POST', body: b }));
}

export function useAddCaseNote(id: number) {
  return useCaseMutation((b: { text: string; fileIds: string[] }) => api<{ case: CaseDetail }>(`/api/cases/${id}/notes`, { method: 'POST', body: b }), { inline: true });
}

export function useLinkWalk(id: number) {
  return useCaseMutation((walkId: number) => api<{ case: CaseDetail }>(`/api/cases/${id}/walks`, { method: 'POST', body: { walkId } }));
}

export function useHandoff(id: number) {
  return useCaseMutation((b: { assigneeId: number; walkId: number | null; note: string }) => api<{ case: CaseDetail }>(`/api/cases/${id}/handoff`, { method: 'POST', body: b }), { inline: true });
}

export function useSummaryPreview(id: number, walkId: number | null, enabled: boolean) {
  return useQuery({
    queryKey: caseKeys.summary(id, walkId),
    queryFn: () => api<{ preview: SummaryPreview }>(`/api/cases/${id}/summary${walkId ? `?walkId=${walkId}` : ''}`).then((r) => r.preview),
    enabled,
  });
}

export function useSendSummary(id: number) {
  return useCaseMutation((b: { walkId: number | null; to: string; note: string }) => api<{ case: CaseDetail }>(`/api/cases/${id}/summary`, { method: 'POST', body: b }), { inline: true });
}

/** Starts a walk with the existing walks API on the caller's behalf; the case links it next. */
export function startWalkForCaller(b: { guideId: number; site: string | null; line: string | null; applicator: string | null; clientId: string }) {
  return api<{ walk: { id: number } }>('/api/walks', { method: 'POST', body: b }).then((r) => r.walk);
}

export interface GuideChoice {
  id: number;
  title: string;
  symptom: string;
  status: string;
  publishedVersion: number | null;
}

export function usePublishedGuides() {
  return useQuery({
    queryKey: ['guides', 'list', { for: 'cases' }],
    queryFn: () => api<{ guides: GuideChoice[] }>('/api/guides').then((r) => r.guides.filter((g) => g.publishedVersion && g.status === 'active')),
    staleTime: 60_000,
  });
}

export interface ValveChoice {
  id: number;
  tag: string;
  siteName: string;
  lineName: string;
}

/** Registered valves matching a tag; empty while the assets pages are not there. */
export function useValveSearch(q: string) {
  return useQuery({
    queryKey: ['applicators', 'list', { q, for: 'cases' }],
    queryFn: () => api<{ applicators: ValveChoice[] }>(`/api/applicators?${query({ q, status: 'all' })}`).then((r) => (r.applicators ?? []).slice(0, 8)),
    enabled: q.trim().length >= 2,
    retry: false,
    meta: { quiet: true },
  });
}

export function useNotices() {
  return useQuery({ queryKey: caseKeys.notices(), queryFn: () => api<{ notices: NoticeView[]; unread: number }>('/api/notices'), refetchInterval: 60_000, meta: { quiet: true } });
}

export function useReadNotice() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/api/notices/${id}/read`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: caseKeys.notices() }),
  });
}

export function useOutbox(f: { status: string; page: number; pageSize: number }) {
  return useQuery({
    queryKey: caseKeys.outbox(f),
    queryFn: () => api<OutboxList>(`/api/admin/outbox?${query(f)}`),
    placeholderData: keepPreviousData,
    // Messages move from waiting to sent or failed on their own; the page follows.
    refetchInterval: 5000,
  });
}

export function useOutboxMessage(id: number | null) {
  return useQuery({
    queryKey: caseKeys.outboxMessage(id ?? 0),
    queryFn: () => api<{ message: OutboxMessage }>(`/api/admin/outbox/${id}`).then((r) => r.message),
    enabled: id !== null,
  });
}

export function useResend() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<{ message: OutboxMessage }>(`/api/admin/outbox/${id}/resend`, { method: 'POST' }).then((r) => r.message),
    onSuccess: (m) => {
      qc.setQueryData(caseKeys.outboxMessage(m.id), m);
      qc.invalidateQueries({ queryKey: ['outbox', 'list'] });
    },
  });
}
