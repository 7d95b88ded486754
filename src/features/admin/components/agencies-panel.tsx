import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { roleLabels } from '@shared/permissions/ability';
import { createAgencySchema, inviteAgencyAdminSchema, updateAgencySchema, type AgencyDetail, type ContractTermsItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { Skeleton } from '@/components/ui/skeleton';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatCents, formatDate, formatDateTime } from '@/lib/format';
import { useAgencies } from '../api/get-agencies';
import { useAgency } from '../api/get-agency';
import { useCreateAgency } from '../api/create-agency';
import { useUpdateAgency } from '../api/update-agency';
import { useInviteAgencyAdmin } from '../api/invite-agency-admin';
import { AgencyFields } from '@/components/forms/agency-fields';
import { lookupPostalCode } from '../api/lookup-postal-code';
import { Modal } from '@/components/ui/modal';
import { TermsForm } from './terms-form';

const todayIso = () => new Date().toISOString().slice(0, 10);

/** The terms in force on a day (new terms start as a copy of them), else the latest. */
function termsInForce(terms: readonly ContractTermsItem[], day: string): ContractTermsItem | undefined {
  const inForce = terms.filter((t) => t.effectiveFrom <= day && (t.effectiveTo === null || t.effectiveTo >= day));
  const pool = inForce.length > 0 ? inForce : [...terms];
  return pool.sort((x, y) => (x.effectiveFrom < y.effectiveFrom ? 1 : -1))[0];
}

const agencyFieldNames = ['name', 'contactEmail', 'addressLine', 'city', 'region', 'postalCode', 'latitude', 'longitude', 'timeZone', 'adminEmail'] as const;

/** Service agencies: their profile, first admin and contract terms by period. */
export function AgenciesPanel({ selectedId, onSelect }: { selectedId: string | null; onSelect: (id: string | null) => void }) {
  const agencies = useAgencies();
  const [creating, setCreating] = useState(false);
  const [note, setNote] = useState<string | null>(null);
  return (
    <div className="space-y-5">
      {note && <Alert tone="success">{note}</Alert>}
      <Card>
        <CardHeader title="Service agencies" actions={<Button onClick={() => setCreating(true)}>New agency</Button>} />
        {agencies.isPending && <Skeleton className="m-4 h-32" />}
        {agencies.isError && (
          <CardBody>
            <Alert tone="error">{errorMessage(agencies.error)}</Alert>
          </CardBody>
        )}
        {agencies.data && (
          <Table caption="Service agencies">
            <THead>
              <Tr>
                <Th>Agency</Th>
                <Th>Base</Th>
                <Th className="text-right">Users</Th>
                <Th>Terms today</Th>
                <Th>Status</Th>
                <Th>
                  Actions
                </Th>
              </Tr>
            </THead>
            <TBody>
              {agencies.data.map((a) => (
                <Tr key={a.id} className={a.id === selectedId ? 'bg-brass-50' : undefined}>
                  <Td className="font-medium">{a.name}</Td>
                  <Td>{[a.city, a.region].filter(Boolean).join(', ') || '—'}</Td>
                  <Td className="text-right">
                    {a.userCount}
                    {a.activeAdminCount === 0 && <span className="block text-xs text-brass-700">no active admin</span>}
                  </Td>
                  <Td>{a.currentTerms ? `Labor ${formatCents(a.currentTerms.laborRateCents, 'USD')}/h` : <span className="text-brass-700">None in force</span>}</Td>
                  <Td>{a.active ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Deactivated</Badge>}</Td>
                  <Td className="text-right">
                    <Button size="sm" variant="secondary" onClick={() => onSelect(a.id)} aria-label={`Open ${a.name}`}>
                      Open
                    </Button>
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </Card>
      {selectedId && <AgencyDetailCard id={selectedId} onClose={() => onSelect(null)} />}
      <Modal open={creating} onClose={() => setCreating(false)} title="New service agency">
        <CreateAgencyForm
          onDone={(a) => {
            setCreating(false);
            setNote(`${a.name} is created. Its first admin has an invitation e-mail.`);
            onSelect(a.id);
          }}
        />
      </Modal>
    </div>
  );
}

function CreateAgencyForm({ onDone }: { onDone: (a: AgencyDetail) => void }) {
  const create = useCreateAgency();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, getValues, setValue, formState } = useForm<z.input<typeof createAgencySchema>, unknown, z.output<typeof createAgencySchema>>({
    resolver: zodResolver(createAgencySchema),
    defaultValues: { name: '', contactEmail: '', addressLine: '', city: '', region: '', postalCode: null, timeZone: 'America/Chicago', adminEmail: '' },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => create.mutate(v, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, agencyFieldNames)) }));
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <AgencyFields register={register} errors={errors} getValues={getValues} setValue={setValue} lookupPostalCode={lookupPostalCode} />
      <Field label="First agency admin's e-mail" hint="They get a one-time link to set their name and password" error={errors.adminEmail?.message}>
        {(p) => <Input {...p} type="email" {...register('adminEmail')} />}
      </Field>
      <Button type="submit" pending={create.isPending}>
        Create the agency and invite its admin
      </Button>
    </form>
  );
}

function AgencyDetailCard({ id, onClose }: { id: string; onClose: () => void }) {
  const agency = useAgency(id);
  const [editingTerms, setEditingTerms] = useState<ContractTermsItem | 'new' | null>(null);
  const [editingProfile, setEditingProfile] = useState(false);
  const a = agency.data;
  return (
    <Card aria-label="Agency detail">
      <CardHeader
        title={a ? a.name : 'Agency'}
        description={a ? [a.addressLine, a.city, a.region, a.postalCode].filter(Boolean).join(', ') : undefined}
        actions={
          <div className="flex gap-2">
            <Button variant="secondary" size="sm" onClick={() => setEditingProfile(true)} disabled={!a}>
              Edit agency
            </Button>
            <Button variant="ghost" size="sm" onClick={onClose}>
              Close
            </Button>
          </div>
        }
      />
      <CardBody className="space-y-5">
        {agency.isPending && <Skeleton className="h-32" />}
        {agency.isError && <Alert tone="error">{errorMessage(agency.error)}</Alert>}
        {a && (
          <>
            <p className="text-sm text-ink-700">
              {a.latitude !== null && a.longitude !== null ? `Base at ${a.latitude.toFixed(4)}, ${a.longitude.toFixed(4)}` : 'No base coordinates yet'} · {a.timeZone} · {a.userCount} user(s)
            </p>
            {a.pendingInvitations.length > 0 && (
              <div className="text-sm">
                <p className="font-medium text-ink-800">Invitations waiting</p>
                <ul>
                  {a.pendingInvitations.map((i) => (
                    <li key={i.id}>
                      {i.email} · {roleLabels[i.role]} · {i.status === 'expired' ? 'expired' : `valid until ${formatDateTime(i.expiresAt)}`}
                    </li>
                  ))}
                </ul>
              </div>
            )}
            {a.activeAdminCount === 0 && <InviteAdminForm agencyId={a.id} />}
            <section className="space-y-2" aria-label="Contract terms">
              <div className="flex items-center justify-between">
                <h3 className="font-semibold text-ink-900">Contract terms</h3>
                <Button size="sm" onClick={() => setEditingTerms('new')}>
                  New terms
                </Button>
              </div>
              {a.terms.length === 0 ? (
                <p className="text-sm text-ink-600">No contract terms yet: claims of this agency cannot be valued until terms are in force on their repair date.</p>
              ) : (
                <Table caption="Contract terms">
                  <THead>
                    <Tr>
                      <Th>Period</Th>
                      <Th className="text-right">Labor / travel</Th>
                      <Th className="text-right">Mileage</Th>
                      <Th className="text-right">Caps</Th>
                      <Th className="text-right">Parts</Th>
                      <Th className="text-right">Filing</Th>
                      <Th>
                        Actions
                      </Th>
                    </Tr>
                  </THead>
                  <TBody>
                    {a.terms.map((t) => (
                      <Tr key={t.id} className={a.currentTerms?.id === t.id ? 'bg-emerald-50' : undefined}>
                        <Td>
                          {formatDate(t.effectiveFrom)} to {t.effectiveTo ? formatDate(t.effectiveTo) : 'no end date'}
                          {a.currentTerms?.id === t.id && <span className="block text-xs text-emerald-900">in force today</span>}
                        </Td>
                        <Td className="text-right tabular-nums">
                          {formatCents(t.laborRateCents, 'USD')} / {formatCents(t.travelRateCents, 'USD')} per h
                          <span className="block text-xs text-ink-600">overtime × {t.overtimeMultiplier}</span>
                        </Td>
                        <Td className="text-right">{t.mileageRateCents === null ? 'Dated rate' : `${t.mileageRateCents}¢/mi`}</Td>
                        <Td className="text-right tabular-nums">
                          {t.maxRoundTripMiles} mi, {t.maxTravelHours} h
                        </Td>
                        <Td className="text-right tabular-nums">
                          −{t.partsDiscountBps / 100}% +{t.partsHandlingBps / 100}%
                        </Td>
                        <Td className="text-right">{t.filingWindowDays} days</Td>
                        <Td className="text-right">
                          {t.effectiveTo !== null && t.effectiveTo < todayIso() ? (
                            <span className="text-xs text-ink-600">Ended, read-only</span>
                          ) : (
                            <Button size="sm" variant="ghost" onClick={() => setEditingTerms(t)}>
                              Edit
                            </Button>
                          )}
                        </Td>
                      </Tr>
                    ))}
                  </TBody>
                </Table>
              )}
            </section>
          </>
        )}
      </CardBody>
      <Modal open={editingTerms !== null} onClose={() => setEditingTerms(null)} title={editingTerms === 'new' ? 'New contract terms' : 'Edit contract terms'}>
        {a && editingTerms && <TermsForm
            agencyId={a.id}
            terms={editingTerms === 'new' ? undefined : editingTerms}
            copyOf={editingTerms === 'new' ? termsInForce(a.terms, todayIso()) : undefined}
            onDone={() => setEditingTerms(null)}
          />}
      </Modal>
      <Modal open={editingProfile} onClose={() => setEditingProfile(false)} title={a ? `Edit ${a.name}` : 'Edit agency'}>
        {a && editingProfile && <EditAgencyForm agency={a} onDone={() => setEditingProfile(false)} />}
      </Modal>
    </Card>
  );
}

function EditAgencyForm({ agency, onDone }: { agency: AgencyDetail; onDone: () => void }) {
  const update = useUpdateAgency();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, getValues, setValue, formState } = useForm<z.input<typeof updateAgencySchema>, unknown, z.output<typeof updateAgencySchema>>({
    resolver: zodResolver(updateAgencySchema),
    defaultValues: {
      name: agency.name,
      contactEmail: agency.contactEmail ?? '',
      addressLine: agency.addressLine ?? '',
      city: agency.city ?? '',
      region: agency.region ?? '',
      postalCode: agency.postalCode,
      latitude: agency.latitude,
      longitude: agency.longitude,
      timeZone: agency.timeZone,
      active: agency.active,
    },
  });
  const onSubmit = handleSubmit((v) =>
    update.mutate({ id: agency.id, body: v }, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, agencyFieldNames.filter((f) => f !== 'adminEmail'))) }),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <AgencyFields register={register} errors={formState.errors} getValues={getValues} setValue={setValue} currentTimeZone={agency.timeZone} lookupPostalCode={lookupPostalCode} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('active')} /> Active (untick to end every session of the agency's users and stop their sign-in)
      </label>
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}

function InviteAdminForm({ agencyId }: { agencyId: string }) {
  const invite = useInviteAgencyAdmin();
  const [formError, setFormError] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm<z.input<typeof inviteAgencyAdminSchema>, unknown, z.output<typeof inviteAgencyAdminSchema>>({
    resolver: zodResolver(inviteAgencyAdminSchema),
    defaultValues: { email: '' },
  });
  const onSubmit = handleSubmit((v) =>
    invite.mutate(
      { id: agencyId, email: v.email },
      {
        onSuccess: () => {
          setSent(`An invitation is on its way to ${v.email}.`);
          reset();
        },
        onError: (e) => setFormError(applyServerErrors(e, setError, ['email'])),
      },
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-2 rounded-md border border-brass-300 bg-brass-50 p-3" aria-label="Invite an agency admin">
      <p className="text-sm font-medium text-brass-700">This agency has no active admin. Invite one; they then invite their own people.</p>
      {formError && <Alert tone="error">{formError}</Alert>}
      {sent && <Alert tone="success">{sent}</Alert>}
      <div className="flex flex-wrap items-end gap-2">
        <Field label="Admin's e-mail" error={formState.errors.email?.message} className="min-w-64 flex-1">
          {(p) => <Input {...p} type="email" {...register('email')} />}
        </Field>
        <Button type="submit" pending={invite.isPending}>
          Invite
        </Button>
      </div>
    </form>
  );
}
