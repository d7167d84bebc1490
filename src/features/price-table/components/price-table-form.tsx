import { useState } from 'react';
import { Controller, useForm, useWatch, type FieldErrors, type Resolver } from 'react-hook-form';
import type { PriceTable } from '../../../../shared/schemas/price-table';
import { learningCurveFactor } from '../../../../shared/pricing';
import { CurrencyField } from '../../../components/form/currency-field';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { useStudioScope } from '../../../lib/studio-scope';
import { useSavePriceTable } from '../api/save-price-table';
import { fromDraft, toDraft, type DraftIssue, type PriceDraft } from './draft';
import { errorAt, Section } from './form-bits';
import { LeaveGuard } from '../../../components/ui/leave-guard';
import { DiscountsEditor, ExtrasEditor, PresetLinesEditor } from './list-editors';
import { StageHoursGrid } from './stage-hours-grid';
import { TryPrices } from './try-prices';

const LIST_ROOTS = new Set(['extras', 'discounts', 'presetLines', 'stages', 'tiers']);

function errorsFrom(issues: DraftIssue[]): FieldErrors<PriceDraft> {
  const out: Record<string, unknown> = {};
  for (const { path, message } of issues) {
    const parts = LIST_ROOTS.has(path) ? [path, 'root'] : path.split('.');
    let node = out;
    parts.forEach((part, i) => {
      if (i === parts.length - 1) {
        node[part] = { ...(node[part] as object | undefined), type: 'validate', message };
      } else {
        node[part] = (node[part] as Record<string, unknown> | undefined) ?? {};
        node = node[part] as Record<string, unknown>;
      }
    });
  }
  return out as FieldErrors<PriceDraft>;
}

/** Reads the boxes the way the save will, so the marks beside them are the save's own reasons. */
const draftResolver: Resolver<PriceDraft> = async (values) => {
  const { issues } = fromDraft(values);
  return issues.length === 0 ? { values, errors: {} } : { values: {}, errors: errorsFrom(issues) };
};

function firstTierWithErrors(errors: FieldErrors<PriceDraft>, tiers: PriceDraft['tiers']): string | null {
  const grid = errors.stageHours as Record<string, Record<string, unknown> | undefined> | undefined;
  if (!grid) return null;
  for (const t of tiers) if (Object.values(grid).some((size) => size?.[t.key])) return t.key;
  return null;
}

/** How a learning rate plays out, in words: "2 figures take 1.8 times as long as one, …". */
function BatchExample({ rate }: { rate: string }) {
  const r = Number(rate);
  if (!/^(0(\.\d+)?|1(\.0+)?)$/.test(rate.trim()) || r < 0.5 || r > 1) return <p className="text-sm text-sable-600">Enter a rate from 0.5 to 1 to see what it does.</p>;
  const f = (n: number) => (Math.round(learningCurveFactor(n, r) * 10) / 10).toLocaleString(undefined, { maximumFractionDigits: 1 });
  return (
    <p className="figures text-sm text-sable-900">
      With {rate.trim()}: 2 identical figures take {f(2)} times as long as one, 5 take {f(5)} times, 10 take {f(10)} times.
    </p>
  );
}

export function PriceTableForm({ table }: { table: PriceTable }) {
  const { studioId } = useStudioScope();
  const save = useSavePriceTable(studioId);
  const toast = useToast();
  const [tier, setTier] = useState(table.tiers[0]?.key ?? '');
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isDirty, isSubmitted },
  } = useForm<PriceDraft>({ resolver: draftResolver, defaultValues: toDraft(table) });
  const currency = (useWatch({ control, name: 'currency' }) ?? '').trim().toUpperCase() || '—';
  const learningRate = useWatch({ control, name: 'learningRate' }) ?? '';
  const stages = table.stages;
  const tiers = table.tiers;
  const hasErrors = Object.keys(errors).length > 0;

  const onSubmit = handleSubmit(
    async (values) => {
      setFormError(null);
      try {
        const saved = await save.mutateAsync(fromDraft(values).table);
        reset(toDraft(saved));
        toast.show('Prices saved. New quotes use them; quotes already sent keep theirs.');
      } catch (err) {
        setFormError(applyServerErrors(err, setError));
      }
    },
    (errs) => {
      const t = firstTierWithErrors(errs, tiers);
      const others = Object.keys(errs).filter((k) => k !== 'stageHours');
      if (t && others.length === 0) setTier(t);
    },
  );

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-6" aria-label="Price table">
      <LeaveGuard dirty={isDirty && !save.isPending} />
      {formError && <ErrorNote title="The prices were not saved">{formError}</ErrorNote>}

      <Section id="pt-rate" title="Rate and currency" description="Bench time is priced at this rate. Quotes and invoices are in this currency.">
        <div className="grid gap-4 sm:grid-cols-2">
          <Controller
            control={control}
            name="currency"
            render={({ field, fieldState }) => (
              <CurrencyField
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                error={fieldState.error?.message}
                hint="Amounts below are read in this currency. Quotes already sent keep theirs."
              />
            )}
          />
          <TextField
            label={`Hourly rate (${currency})`}
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="Write it with a point and no thousands separator, such as 32.50."
            error={errorAt(errors, 'hourlyRate')}
            {...register('hourlyRate')}
          />
        </div>
      </Section>

      <Section
        id="pt-hours"
        title="Hours per stage"
        description="How long ONE figure takes in each stage, in hours (1.25 is 1 h 15 min; 0 if a stage is not needed). Identical figures in one batch follow the batch saving further down."
      >
        <StageHoursGrid register={register} control={control} errors={errors} stages={stages} tiers={tiers} tier={tier} onTierChange={setTier} />
      </Section>

      <Section
        id="pt-extras"
        title="Extras"
        description="Chosen per figure on a quote. Added hours are worked in the stage you pick and get the batch saving; a flat price is charged for every figure."
      >
        <ExtrasEditor register={register} control={control} errors={errors} currency={currency} stages={stages} />
      </Section>

      <Section id="pt-order" title="Materials, minimum order and rush">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label={`Materials per figure (${currency})`}
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="Primer, paint, varnish and basing material for one figure."
            error={errorAt(errors, 'materialsPerFigure')}
            {...register('materialsPerFigure')}
          />
          <TextField
            label={`Minimum order (${currency})`}
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="Smaller orders are topped up to this; 0 for no minimum."
            error={errorAt(errors, 'minimumOrder')}
            {...register('minimumOrder')}
          />
          <TextField
            label="Rush when due within (weeks)"
            className="figures"
            inputMode="numeric"
            autoComplete="off"
            hint="0 turns the rush surcharge off."
            error={errorAt(errors, 'rush.weeks')}
            {...register('rush.weeks')}
          />
          <TextField
            label="Rush surcharge (%)"
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="Added to the figures’ price when the due date is that close."
            error={errorAt(errors, 'rush.surchargeBp')}
            {...register('rush.surchargeBp')}
          />
        </div>
      </Section>

      <Section
        id="pt-discounts"
        title="Discounts by order total"
        description="The highest step the figures’ price reaches applies (steps do not add up). Shipping and other lines neither count towards it nor get it."
      >
        <DiscountsEditor register={register} control={control} errors={errors} currency={currency} />
      </Section>

      <Section id="pt-tax" title="Tax">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Tax name" autoComplete="off" hint="As on your invoices: VAT, GST, Sales tax." error={errorAt(errors, 'tax.label')} {...register('tax.label')} />
          <TextField
            label="Tax rate (%)"
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="0 if you do not charge tax."
            error={errorAt(errors, 'tax.rateBp')}
            {...register('tax.rateBp')}
          />
          <SelectField label="Your prices" error={errorAt(errors, 'tax.pricesIncludeTax')} {...register('tax.pricesIncludeTax')}>
            <option value="excluded">Do not include tax — it is added on top</option>
            <option value="included">Already include tax</option>
          </SelectField>
          <TextField label="Tax ID" optional autoComplete="off" hint="Printed on your invoices." error={errorAt(errors, 'tax.taxId')} {...register('tax.taxId')} />
        </div>
      </Section>

      <Section id="pt-terms-money" title="Deposit, batches and quotes">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Deposit (%)"
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="Asked for when the client accepts a quote. 20–50 % is common practice."
            error={errorAt(errors, 'depositBp')}
            {...register('depositBp')}
          />
          <TextField
            label="Quotes are valid for (days)"
            className="figures"
            inputMode="numeric"
            autoComplete="off"
            hint="30 days is common practice."
            error={errorAt(errors, 'quoteValidityDays')}
            {...register('quoteValidityDays')}
          />
          <TextField
            label="Batch saving (learning rate)"
            className="figures"
            inputMode="decimal"
            autoComplete="off"
            hint="From 0.5 to 1. At 0.9, each time the number of identical figures doubles, the average time per figure falls to 90 %. 1 means no saving."
            error={errorAt(errors, 'learningRate')}
            {...register('learningRate')}
          />
          <div className="self-center rounded-control border border-primer-300 bg-white p-3">
            <BatchExample rate={learningRate} />
          </div>
          <label className="flex items-start gap-2 text-sm sm:col-span-2">
            <input type="checkbox" className="mt-0.5 size-4 accent-verdigris-600" {...register('showHoursToClient')} />
            <span>
              Show hours to clients
              <span className="block text-xs text-sable-600">Clients then see the hours of each line on their quotes; otherwise only prices.</span>
            </span>
          </label>
        </div>
      </Section>

      <Section id="pt-terms" title="Terms" description="Shown on every quote; the client ticks that they accept them. Cancellation, deposit refund and revisions belong here.">
        <TextArea label="Your terms" rows={10} error={errorAt(errors, 'terms')} {...register('terms')} />
      </Section>

      <Section id="pt-presets" title="Ready-made lines" description="Added to a quote with one click: shipping, insurance, models you buy for the client.">
        <PresetLinesEditor register={register} control={control} errors={errors} currency={currency} />
      </Section>

      <Section id="pt-try" title="Try these prices" description="What one line of a quote comes to with the prices as typed above, before discounts and tax.">
        <TryPrices control={control} />
      </Section>

      <div className="sticky bottom-16 z-20 -mx-2 flex flex-wrap items-center gap-3 rounded-card border border-primer-300 bg-bone-50 p-3 shadow-raised sm:bottom-4">
        <Button type="submit" loading={save.isPending}>
          Save prices
        </Button>
        <span className="text-sm text-sable-600" aria-live="polite">
          {hasErrors && isSubmitted ? 'Some boxes need a look — they are marked in red.' : isDirty ? 'You have changes that are not saved yet.' : 'All saved.'}
        </span>
      </div>
    </form>
  );
}
