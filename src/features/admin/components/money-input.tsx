import { useEffect, useState } from 'react';
import { Input } from '@/components/ui/input';
import type { FieldControlProps } from '@/components/ui/field';

const toText = (cents: number | null | undefined) => (cents === null || cents === undefined || Number.isNaN(cents) ? '' : (cents / 100).toFixed(2));

/**
 * Dollars on screen, integer cents in the form: "412.50" -> 41250. Anything that is not an
 * amount with at most two decimals gives NaN, which the schema reports on the field.
 */
export function MoneyInput({
  value,
  onChange,
  onBlur,
  control,
  nullable = false,
}: {
  value: number | null | undefined;
  onChange: (cents: number | null) => void;
  onBlur?: () => void;
  control: FieldControlProps;
  nullable?: boolean;
}) {
  const [text, setText] = useState(toText(value));
  useEffect(() => {
    const parsed = parse(text);
    if (parsed !== value && !(Number.isNaN(parsed) && Number.isNaN(value))) setText(toText(value));
    // Only an outside change of the value rewrites the text.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  function parse(t: string): number | null {
    const s = t.trim().replace(/[$,\s]/g, '');
    if (s === '') return nullable ? null : Number.NaN;
    if (!/^\d+(\.\d{1,2})?$/.test(s)) return Number.NaN;
    return Math.round(Number(s) * 100);
  }
  return (
    <div className="relative">
      <span aria-hidden="true" className="pointer-events-none absolute inset-y-0 left-3 flex items-center text-ink-600">
        $
      </span>
      <Input
        {...control}
        inputMode="decimal"
        className="pl-7"
        value={text}
        onBlur={onBlur}
        onChange={(e) => {
          setText(e.target.value);
          onChange(parse(e.target.value));
        }}
      />
    </div>
  );
}
