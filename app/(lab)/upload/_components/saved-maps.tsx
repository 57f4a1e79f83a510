"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import type { ColumnMap } from "@/lib/analysis/types";
import { saveColumnMapAction } from "../actions";

export interface SavedMapOption {
  id: string;
  name: string;
  ownerName: string;
  map: ColumnMap;
}

const controlClass = "rounded border border-rule-strong bg-white px-2 py-1 text-sm";

/**
 * Apply a named column map someone saved for this kind of log, or save the corrected one under a
 * name, so the next export from the same instrument needs no correction.
 */
export function SavedMaps({
  idPrefix,
  maps,
  map,
  onApply,
  onSaved,
}: {
  idPrefix: string;
  maps: SavedMapOption[];
  map: ColumnMap;
  onApply: (map: ColumnMap) => void;
  onSaved: (saved: SavedMapOption) => void;
}) {
  const [name, setName] = useState("");
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [pending, setPending] = useState(false);

  async function save() {
    setPending(true);
    const result = await saveColumnMapAction({ name, map });
    setPending(false);
    if (result.ok) {
      setMessage({ ok: true, text: `Saved as "${name.trim()}".` });
      onSaved({ id: result.data.id, name: name.trim(), ownerName: "you", map });
      setName("");
    } else {
      setMessage({ ok: false, text: result.fieldErrors?.name?.join(" ") ?? result.error });
    }
  }

  return (
    <div className="flex flex-wrap items-end gap-3 text-sm">
      {maps.length > 0 ? (
        <label htmlFor={`${idPrefix}-saved`} className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
          Use a saved column map
          <select
            id={`${idPrefix}-saved`}
            className={controlClass}
            defaultValue=""
            onChange={(e) => {
              const chosen = maps.find((m) => m.id === e.target.value);
              if (chosen) onApply(chosen.map);
            }}
          >
            <option value="">choose…</option>
            {maps.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name} ({m.ownerName})
              </option>
            ))}
          </select>
        </label>
      ) : null}
      <label htmlFor={`${idPrefix}-save-name`} className="flex flex-col gap-1 text-xs font-medium text-ink-soft">
        Save these columns as
        <input id={`${idPrefix}-save-name`} className={controlClass} value={name} maxLength={80} placeholder="e.g. Load bank, channel export" onChange={(e) => setName(e.target.value)} />
      </label>
      <Button disabled={pending || name.trim() === ""} onClick={() => void save()}>
        {pending ? "Saving…" : "Save column map"}
      </Button>
      {message ? (
        <p role="status" className={message.ok ? "text-ok" : "text-danger"}>
          {message.text}
        </p>
      ) : null}
    </div>
  );
}
