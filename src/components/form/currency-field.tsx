import { useState } from 'react';
import { SelectField, TextField } from '../ui/field';

/** The currencies most studios bill in; any other ISO 4217 code can be typed in. */
export const COMMON_CURRENCIES = ['EUR', 'USD', 'GBP', 'CAD', 'AUD', 'NZD', 'CHF', 'SEK', 'NOK', 'DKK', 'PLN', 'CZK', 'HUF', 'JPY', 'SGD', 'BRL', 'MXN', 'ZAR'] as const;

const OTHER = '__other';

function currencyName(code: string): string {
  try {
    return new Intl.DisplayNames(['en'], { type: 'currency' }).of(code) ?? code;
  } catch {
    return code;
  }
}

/**
 * Controlled: the form owns the value (a code string). A select of common codes, and a text box
 * when "Another currency" is chosen or the saved code is not in the list.
 */
export function CurrencyField({
  value,
  onChange,
  onBlur,
  error,
  label = 'Currency',
  hint = 'Quotes and invoices use this currency.',
}: {
  value: string;
  onChange: (code: string) => void;
  onBlur?: () => void;
  error?: string;
  label?: string;
  hint?: string;
}) {
  const upper = value.trim().toUpperCase();
  const inList = (COMMON_CURRENCIES as readonly string[]).includes(upper);
  const [other, setOther] = useState(() => upper !== '' && !inList);
  const showOther = other || (upper !== '' && !inList);

  return (
    <div className="flex flex-col gap-3">
      <SelectField
        label={label}
        hint={showOther ? undefined : hint}
        error={showOther ? undefined : error}
        value={showOther ? OTHER : upper}
        onBlur={onBlur}
        onChange={(e) => {
          if (e.target.value === OTHER) {
            setOther(true);
            onChange('');
          } else {
            setOther(false);
            onChange(e.target.value);
          }
        }}
      >
        <option value="" disabled>
          Choose a currency
        </option>
        {COMMON_CURRENCIES.map((code) => (
          <option key={code} value={code}>
            {code} — {currencyName(code)}
          </option>
        ))}
        <option value={OTHER}>Another currency…</option>
      </SelectField>
      {showOther && (
        <TextField
          label="Currency code"
          hint="Three letters, as on a bank statement, for example THB or KRW."
          error={error}
          value={value}
          maxLength={3}
          autoCapitalize="characters"
          autoComplete="off"
          spellCheck={false}
          onBlur={onBlur}
          onChange={(e) => onChange(e.target.value.toUpperCase())}
        />
      )}
    </div>
  );
}
