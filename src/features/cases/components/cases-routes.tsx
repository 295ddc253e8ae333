// The support desk's pages under /cases (the queue, logging a call, one case) and the admin outbox.
import type { ReactNode } from 'react';
import { Route, Routes } from 'react-router';
import { useCan } from '@/lib/auth';
import { Forbidden, NotFoundPage } from '@/components/errors/route-error';
import { CaseListPage } from './case-list-page';
import { CasePage } from './case-page';
import { LogCallPage } from './log-call-page';

export { OutboxPage } from './outbox-page';
export { CaseQueue } from './case-queue';
export { NoticesList } from './notices-list';

function SupportDeskOnly({ children }: { children: ReactNode }) {
  return useCan('cases:work') ? <>{children}</> : <Forbidden />;
}

export function CasesRoutes() {
  return (
    <Routes>
      <Route index element={<CaseListPage />} />
      <Route
        path="new"
        element={
          <SupportDeskOnly>
            <LogCallPage />
          </SupportDeskOnly>
        }
      />
      <Route path=":id" element={<CasePage />} />
      <Route path="*" element={<NotFoundPage />} />
    </Routes>
  );
}
