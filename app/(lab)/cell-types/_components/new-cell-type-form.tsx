"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useActionState, useState } from "react";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import { queryKeys } from "@/lib/api/query-keys";
import type { ActionResult } from "@/lib/auth/action-result";
import { chemistryPresets, provenanceLabels, type ChemistryPreset, type PresetValue, type Provenance } from "@/lib/domain/presets";
import { formatTermination } from "@/lib/registry/format";
import { chemistries } from "@/lib/validations/registry";
import { createCellTypeAction } from "../actions";

type PresetField = Exclude<keyof ChemistryPreset, "chemistry" | "label" | "remark">;
type FieldName = PresetField | "name" | "chemistry" | "ratedCapacityMah" | "notes";

interface NumberInput {
  name: PresetField;
  label: string;
  /** Temperatures can be negative; a decimal keypad often has no minus key. */
  signed?: boolean;
}

const groups: { title: string; fields: NumberInput[] }[] = [
  {
    title: "Voltages",
    fields: [
      { name: "nominalVoltageV", label: "Nominal voltage (V)" },
      { name: "chargeVoltageLimitV", label: "Charge voltage limit (V)" },
      { name: "dischargeCutoffV", label: "Discharge cut-off (V)" },
    ],
  },
  {
    title: "Currents, as multiples of 1C",
    fields: [
      { name: "maxChargeC", label: "Highest charge rate (C)" },
      { name: "maxDischargeC", label: "Highest discharge rate (C)" },
      { name: "terminationC", label: "Charge ends when the current falls to (× 1C)" },
    ],
  },
  {
    title: "Temperatures",
    fields: [
      { name: "chargeTempMinC", label: "Charging from (°C)", signed: true },
      { name: "chargeTempMaxC", label: "Charging up to (°C)", signed: true },
      { name: "dischargeTempMinC", label: "Discharging from (°C)", signed: true },
      { name: "dischargeTempMaxC", label: "Discharging up to (°C)", signed: true },
    ],
  },
];

const provenanceTone: Record<Provenance, BadgeTone> = { trade: "neutral", source: "good", memory: "warn" };

const emptyValues = (): Record<FieldName, string> => ({
  name: "",
  chemistry: "",
  ratedCapacityMah: "",
  notes: "",
  nominalVoltageV: "",
  chargeVoltageLimitV: "",
  dischargeCutoffV: "",
  maxChargeC: "",
  maxDischargeC: "",
  terminationC: "",
  chargeTempMinC: "",
  chargeTempMaxC: "",
  dischargeTempMinC: "",
  dischargeTempMaxC: "",
});

function ProvenanceHint({ preset, current }: { preset: PresetValue; current: string }) {
  const same = Number(current.replace(",", ".")) === preset.value && current.trim() !== "";
  if (!same) return <>Changed from the preset&apos;s {preset.value}.</>;
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      <Badge tone={provenanceTone[preset.provenance]}>{provenanceLabels[preset.provenance]}</Badge>
      {preset.note ? <span>{preset.note}</span> : null}
    </span>
  );
}

export function NewCellTypeForm() {
  const queryClient = useQueryClient();
  const [values, setValues] = useState(emptyValues);
  const [presetChoice, setPresetChoice] = useState("");
  const [applied, setApplied] = useState<ChemistryPreset | null>(null);
  const [state, submit, pending] = useActionState<ActionResult<{ id: string }> | null, FormData>(async (_prev, form) => {
    const result = await createCellTypeAction(form);
    if (result.ok) {
      setValues(emptyValues());
      setApplied(null);
      void queryClient.invalidateQueries({ queryKey: queryKeys.cellTypes.all });
    }
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  const set = (name: FieldName, value: string) => setValues((v) => ({ ...v, [name]: value }));

  function fillPreset() {
    const preset = chemistryPresets.find((p) => p.chemistry === presetChoice);
    if (!preset) return;
    setApplied(preset);
    setValues((v) => {
      const next = { ...v, chemistry: preset.chemistry };
      for (const group of groups) for (const field of group.fields) next[field.name] = String(preset[field.name].value);
      return next;
    });
  }

  const termination = Number(values.terminationC.replace(",", "."));
  const hintFor = (field: NumberInput) => {
    const preset = applied?.[field.name];
    const parts = [];
    if (preset) parts.push(<ProvenanceHint key="p" preset={preset} current={values[field.name]} />);
    if (field.name === "terminationC" && termination > 0 && termination <= 1)
      parts.push(<span key="t"> That is {formatTermination(termination)}.</span>);
    return parts.length ? parts : undefined;
  };

  return (
    <Panel title="Add a cell type">
      <form action={submit} className="space-y-6" noValidate>
        <fieldset className="rounded-md border border-copper/40 bg-copper-wash/50 p-4">
          <legend className="px-1 text-sm font-semibold">Start from a chemistry preset (optional)</legend>
          <div className="flex flex-wrap items-end gap-3">
            <div className="min-w-56 flex-1">
              <SelectField label="Chemistry preset" value={presetChoice} onChange={(e) => setPresetChoice(e.target.value)}>
                <option value="">Choose a preset…</option>
                {chemistryPresets.map((p) => (
                  <option key={p.chemistry} value={p.chemistry}>
                    {p.chemistry}: {p.label}
                  </option>
                ))}
              </SelectField>
            </div>
            <Button onClick={fillPreset} disabled={!presetChoice}>
              Fill in the preset&apos;s values
            </Button>
          </div>
          <p className="mt-3 text-sm">
            A preset is a starting point. Each value it fills in says where it comes from: <em>common practice</em>, <em>public specifications</em>, or{" "}
            <em>from memory — verify</em>. <strong>The cell maker&apos;s data sheet wins:</strong> check every value against it before saving. Runs are
            checked against these limits, and a lithium cell taken past them can swell, vent or catch fire.
          </p>
          {applied?.remark ? <p className="mt-2 text-sm text-warn">{applied.remark}</p> : null}
        </fieldset>

        <div className="grid gap-4 md:grid-cols-3">
          <TextField
            label="Name"
            name="name"
            required
            value={values.name}
            onChange={(e) => set("name", e.target.value)}
            errors={errors.name}
            hint="As your lab calls it, e.g. the maker's model and capacity."
          />
          <SelectField
            label="Chemistry"
            name="chemistry"
            required
            value={values.chemistry}
            onChange={(e) => set("chemistry", e.target.value)}
            errors={errors.chemistry}
          >
            <option value="" disabled>
              Choose…
            </option>
            {chemistries.map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </SelectField>
          <TextField
            label="Rated capacity (mAh)"
            name="ratedCapacityMah"
            inputMode="decimal"
            required
            value={values.ratedCapacityMah}
            onChange={(e) => set("ratedCapacityMah", e.target.value)}
            errors={errors.ratedCapacityMah}
            hint="From the data sheet; no preset has one. 1C is this many mA."
          />
        </div>

        {groups.map((group) => (
          <fieldset key={group.title}>
            <legend className="mb-2 text-sm font-semibold text-ink">{group.title}</legend>
            <div className={`grid gap-4 sm:grid-cols-2 ${group.fields.length === 4 ? "lg:grid-cols-4" : "md:grid-cols-3"}`}>
              {group.fields.map((field) => (
                <TextField
                  key={field.name}
                  label={field.label}
                  name={field.name}
                  inputMode={field.signed ? "text" : "decimal"}
                  required
                  autoComplete="off"
                  value={values[field.name]}
                  onChange={(e) => set(field.name, e.target.value)}
                  errors={errors[field.name]}
                  hint={hintFor(field)}
                />
              ))}
            </div>
          </fieldset>
        ))}

        <TextAreaField
          label="Notes"
          name="notes"
          rows={2}
          value={values.notes}
          onChange={(e) => set("notes", e.target.value)}
          errors={errors.notes}
          hint="Data sheet revision, deviations from the preset, handling remarks."
        />
        <FormMessage state={state} success={() => "Cell type added."} />
        <Button type="submit" tone="primary" disabled={pending}>
          {pending ? "Saving…" : "Add cell type"}
        </Button>
      </form>
    </Panel>
  );
}
