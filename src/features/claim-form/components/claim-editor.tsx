import { useMemo, useRef, useState, type ReactNode } from 'react';
import { useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import type { Valuation } from '@shared/calculations/valuation';
import { claimDraftSchema, type ClaimDetail } from '@shared/schemas/claim';
import { isReasonCode } from '@shared/workflow/reason-codes';
import { validateForSubmit, type SubmitProblem } from '@shared/workflow/submit-validation';
import { Alert } from '@/components/ui/alert';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage, isApiError, type ApiError } from '@/lib/api-client';
import { useBusinessToday } from '@/lib/business-day';
import { formatCents, plural } from '@/lib/format';
import { useModels } from '../api/get-models';
import { useParts } from '../api/get-parts';
import { useRepairCodes } from '../api/get-repair-codes';
import { useValuationBasis } from '../api/get-valuation-basis';
import { claimFormKeys } from '../api/claim-form-keys';
import { reloadClaim } from '../api/get-claim';
import { useAutosave } from '../hooks/use-autosave';
import { useLiveValuation } from '../hooks/use-live-valuation';
import { detailToValues, reasonSections, requiredReadings, submitFactsOf, type ClaimFormValues, type FormSection } from '../form-model';
import { CheckSection } from './check-section';
import { CoveragePanel } from './coverage-panel';
import { DatesSection } from './dates-section';
import { EvidenceSection } from './evidence-section';
import { FormSection as Section } from './form-section';
import { LaborSection } from './labor-section';
import { PartsSection } from './parts-section';
import { ReadingsSection } from './readings-section';
import { ReviewerNote, type ReturnInfo } from './reviewer-note';
import { SaveStatus } from './save-status';
import { StorySection } from './story-section';
import { TravelSection } from './travel-section';

export interface ClaimEditorProps {
  /** The claim as the cache holds it now (the form reads it once, then owns the values). */
  claim: ClaimDetail;
  /** Renders the computed breakdown (the claim page's component). */
  renderValuation: (valuation: Valuation) => ReactNode;
  /** Sends the submit move with the version autosave left on the server. */
  submitClaim: (version: number) => Promise<ClaimDetail>;
  onSubmitted: (claim: ClaimDetail) => void;
  /** Beside the claim number: e.g. the state badge and withdraw. */
  headerExtra?: ReactNode;
  /** The evidence upload, placed in the evidence section; onImported after the server took in a readings sheet. */
  renderUploader?: (helpers: { gas: boolean; onImported: () => void }) => ReactNode;
  /** Under the form: e.g. the comments and timeline. */
  footer?: ReactNode;
}

const EMPTY: never[] = [];

/** The latest return of the claim (reason, comment, who, when), while it is returned. */
export function latestReturn(claim: Pick<ClaimDetail, 'state' | 'events'>): ReturnInfo | null {
  if (claim.state !== 'returned') return null;
  const last = [...claim.events].filter((e) => e.type === 'return').sort((a, b) => b.at.localeCompare(a.at))[0];
  return last ? { reason: last.reason, comment: last.comment, actorName: last.actorName, at: last.at } : null;
}

/**
 * The claim editor: dates, complaint / cause / correction, labor, travel, parts, readings,
 * evidence, then the check step; saved on the server as the technician works, with the
 * valuation computed in the browser as the form changes.
 */
export function ClaimEditor({ claim, renderValuation, submitClaim, onSubmitted, headerExtra, renderUploader, footer }: ClaimEditorProps) {
  const queryClient = useQueryClient();
  const family = claim.unit?.model.familyId ?? null;
  const repairCodes = useRepairCodes(family);
  const parts = useParts(family);
  const models = useModels(family);
  const basis = useValuationBasis(claim.id);
  const model = models.data?.items.find((m) => m.id === claim.unit?.model.id);
  const specs = model?.readingSpecs ?? EMPTY;
  const gas = model?.family.fuel === 'gas';
  const codes = repairCodes.data?.items ?? EMPTY;
  const catalogParts = parts.data?.items ?? EMPTY;

  const initial = useMemo(() => detailToValues(claim), [claim.id]); // eslint-disable-line react-hooks/exhaustive-deps
  const form = useForm<ClaimFormValues>({
    defaultValues: initial,
    resolver: zodResolver(claimDraftSchema) as unknown as Resolver<ClaimFormValues>,
    mode: 'onTouched',
  });
  const [notice, setNotice] = useState<string | null>(null);
  const [checked, setChecked] = useState(false);
  const [submitting, setSubmitting] = useState(false);
  const [submitError, setSubmitError] = useState<string | null>(null);
  const [serverProblems, setServerProblems] = useState<Array<{ path: string; message: string }>>([]);
  const latest = useRef(claim);
  latest.current = claim;

  const detailKey = claimFormKeys.claimDetail(claim.id);
  const reload = (): Promise<ClaimDetail | undefined> => reloadClaim(queryClient, claim.id).catch(() => undefined);

  const onConflict = async (e: ApiError) => {
    const fresh = await reload();
    if (e.code === 'stale_version' && fresh) {
      const values = detailToValues(fresh);
      autosave.rebase(fresh, values);
      form.reset(values);
      setNotice('Someone else changed this claim (another tab or another person at your agency). The latest saved version is shown now; changes made here since your last save were not kept.');
    } else {
      setNotice(errorMessage(e));
    }
  };

  const autosave = useAutosave({
    claimId: claim.id,
    version: claim.version,
    form,
    onSaved: (saved) => {
      queryClient.setQueryData(detailKey, saved);
      void queryClient.invalidateQueries({ queryKey: claimFormKeys.valuationBasis(claim.id) });
      void queryClient.invalidateQueries({ queryKey: ['claims', 'list'] });
    },
    onConflict,
  });

  // A readings sheet imported on the server replaces the readings: take them (and the new version) into the form.
  const onImported = async () => {
    await autosave.flush();
    const fresh = await reload();
    if (!fresh) return;
    const readings = detailToValues(fresh).readings;
    autosave.adopt(fresh, { readings });
    form.setValue('readings', readings);
  };

  const values = useWatch({ control: form.control }) as ClaimFormValues;
  const today = useBusinessToday();
  const live = useLiveValuation(basis.data, values, { repairCodes: codes, parts: catalogParts, specs });
  const lineCodes = new Set(values.laborLines?.map((l) => codes.find((c) => c.id === l?.repairCodeId)?.code).filter((c): c is string => !!c));
  const required = requiredReadings(specs, lineCodes);
  const validation = validateForSubmit(submitFactsOf(values, claim, codes, specs, today));
  const readingProblems: Record<string, string> = {};
  if (checked) for (const p of validation.problems) if (p.path.startsWith('readings.')) readingProblems[p.path] = p.message;

  const returned = latestReturn(claim);
  const returnedSections = new Set<FormSection>(returned && isReasonCode(returned.reason) ? reasonSections[returned.reason] : []);
  const noteFor = (s: FormSection) => (returned && returnedSections.has(s) ? returned : null);
  const resubmit = claim.state === 'returned';

  const submit = async () => {
    setChecked(true);
    setSubmitError(null);
    setServerProblems([]);
    if (validation.problems.length > 0) return;
    setSubmitting(true);
    try {
      const allSaved = await autosave.flush({ mark: true });
      if (!allSaved) {
        setSubmitError('Some changes could not be saved. Fix the marked fields, then submit.');
        return;
      }
      const done = await submitClaim(autosave.version());
      onSubmitted(done);
    } catch (e) {
      if (isApiError(e, 400) && e.fields) {
        setServerProblems(Object.entries(e.fields).map(([path, message]) => ({ path, message })));
      } else if (isApiError(e, 409)) {
        await onConflict(e);
      } else {
        setSubmitError(errorMessage(e));
      }
    } finally {
      setSubmitting(false);
    }
  };

  // A problem of the check step, once the user asked to submit, also sits on its field.
  const markProblems = (problems: readonly SubmitProblem[]) => {
    for (const p of problems) {
      if (['failureDate', 'repairDate', 'complaint', 'cause', 'correction', 'laborLines'].includes(p.path)) {
        form.setError(p.path as 'failureDate', { type: 'submit', message: p.message });
      }
    }
  };

  const catalogLoading = repairCodes.isPending || parts.isPending || models.isPending;
  const catalogError = repairCodes.error ?? parts.error ?? models.error;
  const total = live.valuation?.totals.claimed.totalCents;

  return (
    <>
    <form
      aria-label={`Claim ${claim.number}`}
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
      }}
      className="space-y-5"
    >
      <div className="sticky top-0 z-20 -mx-4 border-b border-ink-100 bg-paper/95 px-4 py-2 backdrop-blur">
        <div className="flex flex-wrap items-center justify-between gap-x-4 gap-y-2">
          <div className="flex flex-wrap items-center gap-3">
            <h1 className="font-mono text-xl font-semibold text-ink-900">{claim.number}</h1>
            {headerExtra}
          </div>
          <div className="flex flex-wrap items-center gap-4">
            <SaveStatus state={autosave.state} onRetry={() => void autosave.flush()} />
            <p className="text-sm text-ink-700">
              Estimate <span className="font-semibold tabular-nums text-ink-900">{total === undefined ? '—' : formatCents(total, claim.currency)}</span>
            </p>
          </div>
        </div>
      </div>

      {notice && (
        <Alert tone="warning" title="The claim changed elsewhere">
          {notice}
        </Alert>
      )}

      {returned && (
        <section aria-labelledby="returned-title" className="space-y-2 rounded-lg border border-brass-300 bg-brass-50 p-4">
          <h2 id="returned-title" className="font-semibold text-ink-900">
            Returned by the reviewer: fix and resubmit
          </h2>
          <ReviewerNote info={returned} />
          <p className="text-sm text-ink-700">
            {claim.resubmissionCount > 0 ? `Resubmitted ${plural(claim.resubmissionCount, 'time')} so far. ` : ''}
            Resubmitting keeps the number {claim.number}.
          </p>
        </section>
      )}

      {catalogError && <Alert tone="error">The catalogue could not be loaded: {errorMessage(catalogError)}</Alert>}

      <div className="grid grid-cols-1 gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div className="space-y-5">
          <Section id="section-unit" title="Unit" note={noteFor('unit')}>
            {claim.unit ? (
              <div className="space-y-3 text-sm">
                <p>
                  <span className="font-mono font-semibold">{claim.unit.model.modelNumber}</span> · {claim.unit.model.name} · serial <span className="font-mono">{claim.unit.serial}</span> · revision{' '}
                  {claim.unit.revision}
                </p>
                {claim.site && (
                  <p className="text-ink-700">
                    {claim.site.name}, {claim.site.addressLine}, {claim.site.city} {claim.site.region}
                  </p>
                )}
                {live.valuation && <CoveragePanel coverage={live.valuation.coverage} on={live.valuation.coverage.failureDate} />}
              </div>
            ) : (
              <Alert tone="warning">This claim has no unit. Withdraw it and start again from the serial number.</Alert>
            )}
          </Section>
          <DatesSection form={form} note={noteFor('dates')} filingWindowDays={basis.data?.input?.contract.filingWindowDays ?? null} />
          <StorySection form={form} note={noteFor('story')} />
          {catalogLoading ? (
            <Spinner label="Loading the labor-time guide and parts…" />
          ) : (
            <>
              <LaborSection form={form} repairCodes={codes} gas={gas} note={noteFor('labor')} />
              <TravelSection
                form={form}
                base={basis.data?.input?.base ?? null}
                site={basis.data?.input?.site ?? null}
                caps={basis.data?.input ? { maxRoundTripMiles: basis.data.input.contract.maxRoundTripMiles, maxTravelHours: basis.data.input.contract.maxTravelHours } : null}
                note={noteFor('travel')}
              />
              <PartsSection form={form} parts={catalogParts} componentTerms={model?.componentTerms ?? EMPTY} currency={claim.currency} note={noteFor('parts')} />
              <ReadingsSection form={form} specs={specs} required={required} gas={gas} note={noteFor('readings')} problems={readingProblems} />
              <EvidenceSection form={form} claim={claim} repairCodes={codes} uploader={renderUploader?.({ gas, onImported: () => void onImported() })} note={noteFor('evidence')} />
            </>
          )}
          {live.valuation ? (
            renderValuation(live.valuation)
          ) : (
            <Card aria-labelledby="live-valuation">
              <CardHeader id="live-valuation" title="Valuation" />
              <CardBody className="text-sm text-ink-700">
                <ul className="list-disc space-y-1 pl-5">
                  {live.problems.map((p) => (
                    <li key={p}>{p}</li>
                  ))}
                </ul>
              </CardBody>
            </Card>
          )}
          <CheckSection
            problems={validation.problems}
            serverProblems={serverProblems}
            canSubmit={claim.allowedActions.includes('submit')}
            saving={autosave.state.status === 'pending' || autosave.state.status === 'saving'}
            submitting={submitting}
            resubmit={resubmit}
            number={claim.number}
            error={submitError}
            onSubmit={() => {
              markProblems(validation.problems);
              void submit();
            }}
          />
        </div>
        <aside className="space-y-5 lg:sticky lg:top-16 lg:self-start" aria-label="Estimate">
          <Card aria-labelledby="estimate-title">
            <CardHeader id="estimate-title" title="Estimate as you type" description="Computed with your contract terms; the reviewer decides the approved amount." />
            <CardBody>
              {live.valuation ? (
                <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm">
                  {(
                    [
                      ['Labor', 'laborCents'],
                      ['Travel', 'travelCents'],
                      ['Parts', 'partsCents'],
                    ] as const
                  ).map(([labelText, k]) => (
                    <div key={k} className="contents">
                      <dt className="text-ink-700">{labelText}</dt>
                      <dd className="text-right tabular-nums">{formatCents(live.valuation!.totals.claimed[k], claim.currency)}</dd>
                    </div>
                  ))}
                  <dt className="border-t border-ink-100 pt-1 font-semibold">Total</dt>
                  <dd className="border-t border-ink-100 pt-1 text-right font-semibold tabular-nums">{formatCents(live.valuation.totals.claimed.totalCents, claim.currency)}</dd>
                </dl>
              ) : (
                <p className="text-sm text-ink-600">{live.problems[0] ?? 'Enter the dates to see the estimate.'}</p>
              )}
              {live.valuation && live.valuation.flags.length > 0 && (
                <ul className="mt-3 space-y-1 text-sm text-brass-700" aria-label="Flags the reviewer will see">
                  {live.valuation.flags.map((f) => (
                    <li key={f.code + f.lineIds.join()}>⚑ {f.label}</li>
                  ))}
                </ul>
              )}
              <p className="mt-3 text-sm text-ink-700">{validation.problems.length === 0 ? 'Ready to submit.' : `${plural(validation.problems.length, 'item')} left before submitting.`}</p>
            </CardBody>
          </Card>
        </aside>
      </div>
    </form>
    {footer}
    </>
  );
}
