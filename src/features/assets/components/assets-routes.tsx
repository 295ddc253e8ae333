// Sites, lines and applicators: the pages under /applicators. Scanning a label opens /applicators/:id.
import { Route, Routes } from 'react-router';
import type { ReactNode } from 'react';
import type { Permission } from '@/shared/permissions';
import { useCan } from '@/lib/auth';
import { Forbidden, NotFoundPage } from '@/components/errors/route-error';
import { ApplicatorListPage } from './applicator-list-page';
import { ApplicatorPage } from './applicator-page';
import { ApplicatorEditPage } from './applicator-edit-page';
import { ServiceEventPage } from './service-event-page';
import { SitesPage } from './sites-page';
import { ImportPage } from './import-page';
import { LabelsPage } from './labels-page';

function Needs({ permission, children }: { permission: Permission; children: ReactNode }) {
  return useCan(permission) ? <>{children}</> : <Forbidden />;
}

export function AssetsRoutes() {
  return (
    <Routes>
      <Route index element={<ApplicatorListPage />} />
      <Route
        path="new"
        element={
          <Needs permission="assets:manage">
            <ApplicatorEditPage />
          </Needs>
        }
      />
      <Route path="sites" element={<SitesPage />} />
      <Route
        path="import"
        element={
          <Needs permission="assets:manage">
            <ImportPage />
          </Needs>
        }
      />
      <Route
        path="labels"
        element={
          <Needs permission="assets:manage">
            <LabelsPage />
          </Needs>
        }
      />
      <Route path=":id" element={<ApplicatorPage />} />
      <Route
        path=":id/edit"
        element={
          <Needs permission="assets:manage">
            <ApplicatorEditPage />
          </Needs>
        }
      />
      <Route
        path=":id/service/new"
        element={
          <Needs permission="assets:record">
            <ServiceEventPage />
          </Needs>
        }
      />
      <Route path="*" element={<NotFoundPage />} />
    </Routes>
  );
}
