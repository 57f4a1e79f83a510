"use client";

import { currentSigns, currentUnits, temperatureUnits, timeFormats, timeUnits, voltageUnits, type ColumnMap } from "@/lib/analysis/types";

const signLabels: Record<(typeof currentSigns)[number], string> = {
  "positive-charges": "signed: positive while charging",
  "negative-charges": "signed: negative while charging",
  "magnitude-with-mode": "magnitude, direction from the mode column",
};
const timeFormatLabels: Record<(typeof timeFormats)[number], string> = {
  elapsed: "elapsed number",
  hms: "elapsed hh:mm:ss",
  timestamp: "date and time",
};

type OptionalRole = "temperature" | "mode" | "step" | "cycle";
const optionalRoles: { role: OptionalRole; label: string }[] = [
  { role: "temperature", label: "Temperature" },
  { role: "mode", label: "Mode / state" },
  { role: "step", label: "Step index" },
  { role: "cycle", label: "Cycle index" },
];

const selectClass = "rounded border border-rule-strong bg-white px-2 py-1 text-sm";

/**
 * Lets a technician confirm or correct which column is which, with units and the current's sign
 * convention. Works on the complete ColumnMap so what is shown is exactly what will be used.
 */
export function ColumnMapEditor({ header, map, onChange, idPrefix }: { header: string[]; map: ColumnMap; onChange: (next: ColumnMap) => void; idPrefix: string }) {
  const columnOptions = header.map((name, index) => (
    <option key={index} value={index}>
      {index + 1}: {name || "(no name)"}
    </option>
  ));
  const pick = (id: string, label: string, value: number | undefined, set: (index: number | undefined) => void, optional: boolean) => (
    <label htmlFor={id} className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
      {label}
      <select id={id} className={selectClass} value={value ?? ""} onChange={(e) => set(e.target.value === "" ? undefined : Number(e.target.value))}>
        {optional ? <option value="">none</option> : null}
        {columnOptions}
      </select>
    </label>
  );

  return (
    <fieldset className="grid gap-3 rounded border border-rule p-3 sm:grid-cols-2 lg:grid-cols-3">
      <legend className="px-1 text-sm font-semibold text-ink">Columns</legend>
      <div className="flex flex-wrap items-end gap-2">
        {pick(`${idPrefix}-time`, "Time", map.time.index, (i) => i !== undefined && onChange({ ...map, time: { ...map.time, index: i, name: header[i] } }), false)}
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
          Time is
          <select className={selectClass} value={map.time.format} onChange={(e) => onChange({ ...map, time: { ...map.time, format: e.target.value as ColumnMap["time"]["format"] } })}>
            {timeFormats.map((f) => (
              <option key={f} value={f}>
                {timeFormatLabels[f]}
              </option>
            ))}
          </select>
        </label>
        {map.time.format === "elapsed" ? (
          <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
            Unit
            <select className={selectClass} value={map.time.unit} onChange={(e) => onChange({ ...map, time: { ...map.time, unit: e.target.value as ColumnMap["time"]["unit"] } })}>
              {timeUnits.map((u) => (
                <option key={u}>{u}</option>
              ))}
            </select>
          </label>
        ) : null}
      </div>
      <div className="flex flex-wrap items-end gap-2">
        {pick(`${idPrefix}-voltage`, "Voltage", map.voltage.index, (i) => i !== undefined && onChange({ ...map, voltage: { ...map.voltage, index: i, name: header[i] } }), false)}
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
          Unit
          <select className={selectClass} value={map.voltage.unit} onChange={(e) => onChange({ ...map, voltage: { ...map.voltage, unit: e.target.value as ColumnMap["voltage"]["unit"] } })}>
            {voltageUnits.map((u) => (
              <option key={u}>{u}</option>
            ))}
          </select>
        </label>
      </div>
      <div className="flex flex-wrap items-end gap-2">
        {pick(`${idPrefix}-current`, "Current", map.current.index, (i) => i !== undefined && onChange({ ...map, current: { ...map.current, index: i, name: header[i] } }), false)}
        <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
          Unit
          <select className={selectClass} value={map.current.unit} onChange={(e) => onChange({ ...map, current: { ...map.current, unit: e.target.value as ColumnMap["current"]["unit"] } })}>
            {currentUnits.map((u) => (
              <option key={u}>{u}</option>
            ))}
          </select>
        </label>
      </div>
      <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft sm:col-span-2 lg:col-span-3">
        Current sign
        <select className={selectClass} value={map.current.sign} onChange={(e) => onChange({ ...map, current: { ...map.current, sign: e.target.value as ColumnMap["current"]["sign"] } })}>
          {currentSigns.map((s) => (
            <option key={s} value={s}>
              {signLabels[s]}
            </option>
          ))}
        </select>
      </label>
      {optionalRoles.map(({ role, label }) => (
        <div key={role} className="flex flex-wrap items-end gap-2">
          {pick(
            `${idPrefix}-${role}`,
            label,
            map[role]?.index,
            (i) => {
              const next = { ...map };
              if (i === undefined) delete next[role];
              else if (role === "temperature") next.temperature = { index: i, name: header[i], unit: map.temperature?.unit ?? "degC" };
              else next[role] = { index: i, name: header[i] };
              onChange(next);
            },
            true,
          )}
          {role === "temperature" && map.temperature ? (
            <label className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
              Unit
              <select
                className={selectClass}
                value={map.temperature.unit}
                onChange={(e) => map.temperature && onChange({ ...map, temperature: { ...map.temperature, unit: e.target.value as NonNullable<ColumnMap["temperature"]>["unit"] } })}
              >
                {temperatureUnits.map((u) => (
                  <option key={u}>{u}</option>
                ))}
              </select>
            </label>
          ) : null}
        </div>
      ))}
    </fieldset>
  );
}
