// Sites with their lines, and the organisation's own applicator fields. Everyone reads; admins
// and authors add, rename and remove.
import { useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { FIELD_TYPE_LABELS, FIELD_TYPES, type FieldView, type LineView, type SiteView } from '@/shared/schemas/assets';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useCan } from '@/lib/auth';
import { showToast } from '@/lib/toasts';
import { Button, ButtonLink } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState, ListSkeleton, Notice } from '@/components/ui/feedback';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page';
import { useFields, useLines, useRemove, useSaveField, useSaveLine, useSaveSite, useSites } from '../api/assets';
import { ExportLinks } from './applicator-list-page';

type Editing = { kind: 'site'; site?: SiteView } | { kind: 'line'; siteId: number; line?: LineView } | { kind: 'field'; field?: FieldView } | null;

export function SitesPage() {
  const manage = useCan('assets:manage');
  const sites = useSites();
  const lines = useLines();
  const fields = useFields();
  const remove = useRemove();
  const [editing, setEditing] = useState<Editing>(null);
  const confirmRemove = (what: string, path: string) => {
    if (window.confirm(`Remove ${what}?`)) remove.mutate(path, { onSuccess: () => showToast(`${what[0].toUpperCase()}${what.slice(1)} removed`, 'ok') });
  };

  return (
    <div className="mx-auto max-w-4xl">
      <Link to="/applicators" className="inline-flex min-h-11 items-center text-sm font-semibold text-amber-deep underline">
        ← Applicators
      </Link>
      <PageHeader
        title="Sites and lines"
        lead="Where the applicators are. A tag is unique on its site, so two plants can both have a V‑1."
        actions={
          <>
            {manage ? <Button onClick={() => setEditing({ kind: 'site' })}>Add a site</Button> : null}
            <ExportLinks
              links={[
                ['Sites', '/api/sites/export.csv'],
                ['Lines', '/api/lines/export.csv'],
                ['Your own fields', '/api/applicators/fields/export.csv'],
              ]}
            />
          </>
        }
      />
      {sites.isPending || lines.isPending ? (
        <ListSkeleton label="Loading sites and lines" rows={3} />
      ) : sites.isError ? (
        <Notice tone="error" title="The sites could not be loaded">
          {errorMessage(sites.error)}
        </Notice>
      ) : sites.data.length === 0 ? (
        <EmptyState
          title="No site yet"
          action={
            manage ? (
              <>
                <Button onClick={() => setEditing({ kind: 'site' })}>Add a site</Button>
                <ButtonLink to="/applicators/import" variant="secondary">
                  Import from CSV
                </ButtonLink>
              </>
            ) : null
          }
        >
          {manage ? <p>Add the first site, then its lines; or import both from CSV files.</p> : <p>An admin or author adds the sites; ask them to add yours.</p>}
        </EmptyState>
      ) : (
        <ul className="space-y-4">
          {sites.data.map((s) => {
            const siteLines = (lines.data ?? []).filter((l) => l.siteId === s.id);
            return (
              <li key={s.id}>
                <Card>
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <div>
                      <h2 className="text-xl font-semibold">{s.name}</h2>
                      {s.address ? <p className="text-ink-soft">{s.address}</p> : null}
                      {s.contact ? <p className="text-sm text-ink-soft">Contact: {s.contact}</p> : null}
                    </div>
                    {manage ? (
                      <div className="flex gap-1">
                        <Button variant="quiet" onClick={() => setEditing({ kind: 'site', site: s })}>
                          Edit
                        </Button>
                        {s.lineCount === 0 ? (
                          <Button variant="quiet" onClick={() => confirmRemove(`site ${s.name}`, `/api/sites/${s.id}`)}>
                            Remove
                          </Button>
                        ) : null}
                      </div>
                    ) : null}
                  </div>
                  <ul className="mt-3 divide-y divide-rule border-t border-rule">
                    {siteLines.map((l) => (
                      <li key={l.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                        <div>
                          <Link to={`/applicators?siteId=${s.id}&lineId=${l.id}`} className="inline-flex min-h-11 items-center font-semibold text-amber-deep underline">
                            {l.name}
                          </Link>
                          <span className="block text-sm text-ink-soft">
                            {[l.area, l.contact ? `contact: ${l.contact}` : null, `${l.applicatorCount} applicator${l.applicatorCount === 1 ? '' : 's'}`].filter(Boolean).join(' · ')}
                          </span>
                        </div>
                        {manage ? (
                          <div className="flex gap-1">
                            <Button variant="quiet" onClick={() => setEditing({ kind: 'line', siteId: s.id, line: l })}>
                              Edit
                            </Button>
                            {l.applicatorCount === 0 ? (
                              <Button variant="quiet" onClick={() => confirmRemove(`line ${l.name}`, `/api/lines/${l.id}`)}>
                                Remove
                              </Button>
                            ) : null}
                          </div>
                        ) : null}
                      </li>
                    ))}
                    {siteLines.length === 0 ? (
                      <li className="py-2 text-sm text-ink-soft">
                        No lines yet. {manage ? 'Add the first with “Add a line”; applicators are registered on a line.' : 'An admin or author adds them.'}
                      </li>
                    ) : null}
                  </ul>
                  {manage ? (
                    <Button variant="secondary" className="mt-2" onClick={() => setEditing({ kind: 'line', siteId: s.id })}>
                      Add a line
                    </Button>
                  ) : null}
                </Card>
              </li>
            );
          })}
        </ul>
      )}

      <section aria-labelledby="own-fields" className="mt-8">
        <h2 id="own-fields" className="text-2xl font-semibold">
          Your own applicator fields
        </h2>
        <p className="mb-3 max-w-prose text-ink-soft">
          Anything else your plants record on a valve (a coil’s resistance, where its spare kit is kept): each field has a name, a type and, for numbers, a unit.
        </p>
        {fields.isPending ? (
          <ListSkeleton label="Loading your own fields" rows={2} />
        ) : fields.isError ? (
          <Notice tone="error" title="The fields could not be loaded">
            {errorMessage(fields.error)}
          </Notice>
        ) : (
          <>
            {fields.data.length === 0 ? (
              <p className="text-ink-soft">None yet. {manage ? 'Add one below when your plants record something the standard fields do not hold.' : 'An admin or author can add them.'}</p>
            ) : null}
            <ul className="divide-y divide-rule rounded-lg border border-rule bg-paper-raised">
              {fields.data.map((f) => (
                <li key={f.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                  <span>
                    <span className="font-semibold">{f.name}</span>
                    <span className="ml-2 text-sm text-ink-soft">
                      {FIELD_TYPE_LABELS[f.type]}
                      {f.unit ? `, in ${f.unit}` : ''}
                    </span>
                  </span>
                  {manage ? (
                    <span className="flex gap-1">
                      <Button variant="quiet" onClick={() => setEditing({ kind: 'field', field: f })}>
                        Edit
                      </Button>
                      <Button variant="quiet" onClick={() => confirmRemove(`the field ${f.name} and its values`, `/api/applicators/fields/${f.id}`)}>
                        Remove
                      </Button>
                    </span>
                  ) : null}
                </li>
              ))}
            </ul>
            {manage ? (
              <Button variant="secondary" className="mt-3" onClick={() => setEditing({ kind: 'field' })}>
                Add a field
              </Button>
            ) : null}
          </>
        )}
      </section>

      {editing?.kind === 'site' ? <SiteDialog site={editing.site} onClose={() => setEditing(null)} /> : null}
      {editing?.kind === 'line' ? <LineDialog siteId={editing.siteId} sites={sites.data ?? []} line={editing.line} onClose={() => setEditing(null)} /> : null}
      {editing?.kind === 'field' ? <FieldDialog field={editing.field} onClose={() => setEditing(null)} /> : null}
    </div>
  );
}

function useFieldErrors() {
  const [fields, setFields] = useState<Record<string, string>>({});
  return { fields, onError: (err: unknown) => setFields(err instanceof ApiError ? err.fields : {}) };
}

function SiteDialog({ site, onClose }: { site?: SiteView; onClose: () => void }) {
  const save = useSaveSite();
  const { fields, onError } = useFieldErrors();
  const [name, setName] = useState(site?.name ?? '');
  const [address, setAddress] = useState(site?.address ?? '');
  const [contact, setContact] = useState(site?.contact ?? '');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate(
      { id: site?.id, name, address, contact },
      {
        onSuccess: () => {
          showToast(site ? 'Site saved' : `Site ${name} added`, 'ok');
          onClose();
        },
        onError,
      },
    );
  };
  return (
    <Dialog open title={site ? `Edit ${site.name}` : 'Add a site'} onClose={onClose}>
      <form onSubmit={submit} className="space-y-4">
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={fields.name} autoFocus />
        <TextField label="Address or area" value={address} onChange={(e) => setAddress(e.target.value)} error={fields.address} />
        <TextField label="Contact" value={contact} onChange={(e) => setContact(e.target.value)} error={fields.contact} hint="Who to call about this site’s lines" />
        {save.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(save.error)} /> : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={save.isPending}>
            {site ? 'Save' : 'Add site'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function LineDialog({ siteId, sites, line, onClose }: { siteId: number; sites: SiteView[]; line?: LineView; onClose: () => void }) {
  const save = useSaveLine();
  const { fields, onError } = useFieldErrors();
  const [site, setSite] = useState(String(siteId));
  const [name, setName] = useState(line?.name ?? '');
  const [area, setArea] = useState(line?.area ?? '');
  const [contact, setContact] = useState(line?.contact ?? '');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate(
      { id: line?.id, siteId: Number(site), name, area, contact },
      {
        onSuccess: () => {
          showToast(line ? 'Line saved' : `Line ${name} added`, 'ok');
          onClose();
        },
        onError,
      },
    );
  };
  return (
    <Dialog open title={line ? `Edit ${line.name}` : 'Add a line'} onClose={onClose}>
      <form onSubmit={submit} className="space-y-4">
        <SelectField label="Site" value={site} onChange={(e) => setSite(e.target.value)} error={fields.siteId}>
          {sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Line name" value={name} onChange={(e) => setName(e.target.value)} error={fields.name} autoFocus placeholder="e.g. Line 3 (carton sealing)" />
        <TextField label="Area" value={area} onChange={(e) => setArea(e.target.value)} error={fields.area} />
        <TextField label="Contact" value={contact} onChange={(e) => setContact(e.target.value)} error={fields.contact} />
        {save.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(save.error)} /> : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={save.isPending}>
            {line ? 'Save' : 'Add line'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function FieldDialog({ field, onClose }: { field?: FieldView; onClose: () => void }) {
  const save = useSaveField();
  const { fields, onError } = useFieldErrors();
  const [name, setName] = useState(field?.name ?? '');
  const [type, setType] = useState<string>(field?.type ?? 'text');
  const [unit, setUnit] = useState(field?.unit ?? '');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate(
      { id: field?.id, name, type, unit: type === 'number' ? unit : '' },
      {
        onSuccess: () => {
          showToast(field ? 'Field saved' : `Field ${name} added`, 'ok');
          onClose();
        },
        onError,
      },
    );
  };
  return (
    <Dialog open title={field ? `Edit ${field.name}` : 'Add a field'} onClose={onClose}>
      <form onSubmit={submit} className="space-y-4">
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={fields.name} autoFocus placeholder="e.g. Coil resistance at 20 °C" />
        <SelectField label="Type" value={type} onChange={(e) => setType(e.target.value)} error={fields.type}>
          {FIELD_TYPES.map((t) => (
            <option key={t} value={t}>
              {FIELD_TYPE_LABELS[t]}
            </option>
          ))}
        </SelectField>
        {type === 'number' ? <TextField label="Unit" value={unit} onChange={(e) => setUnit(e.target.value)} error={fields.unit} placeholder="e.g. ohm" hint="Shown after every value" /> : null}
        {save.isError && !Object.keys(fields).length ? <Notice tone="error" title={errorMessage(save.error)} /> : null}
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={save.isPending}>
            {field ? 'Save' : 'Add field'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
