"use client";

import { useEffect, useRef } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { signatureMeaningLabels, signatureMeanings, type SignatureMeaning } from "@/lib/validations/signature";

interface SignatureFieldsProps {
  /** What signing means here, said before the person signs. */
  statement: string;
  meaning: SignatureMeaning;
  onMeaningChange: (meaning: SignatureMeaning) => void;
  errors: Record<string, string[]>;
}

/**
 * The password and meaning of an electronic signature. The password box is left uncontrolled so
 * the form's reset after each submission empties it: it is never kept or shown again.
 */
export function SignatureFields({ statement, meaning, onMeaningChange, errors }: SignatureFieldsProps) {
  const box = useRef<HTMLFieldSetElement>(null);
  // That reset puts a select back to the option its markup marks as selected, and React marks only
  // the first render's (a known React 19 behaviour): mark the current meaning, so a signature refused
  // for a wrong password keeps the meaning chosen instead of posting the first one on the next try.
  useEffect(() => {
    box.current?.querySelectorAll<HTMLOptionElement>('select[name="meaning"] option').forEach((o) => {
      o.defaultSelected = o.value === meaning;
    });
  }, [meaning]);
  return (
    <fieldset ref={box} className="space-y-3 rounded-md border border-rule-strong p-3">
      <legend className="px-1 text-sm font-medium text-ink">Your signature</legend>
      <p className="text-xs text-ink-soft">{statement}</p>
      <SelectField
        label="Meaning of your signature"
        name="meaning"
        value={meaning}
        onChange={(e) => onMeaningChange(e.target.value as SignatureMeaning)}
        errors={errors.meaning}
      >
        {signatureMeanings.map((m) => (
          <option key={m} value={m}>
            {signatureMeaningLabels[m]}
          </option>
        ))}
      </SelectField>
      <TextField label="Your password" name="password" type="password" autoComplete="current-password" required maxLength={128} errors={errors.password} />
    </fieldset>
  );
}
