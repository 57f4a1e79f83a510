"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useCallback, useId, useRef, useState, type DragEvent } from "react";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { Panel } from "@/components/ui/panel";
import { previewLog, type LogPreview } from "@/lib/analysis/read";
import type { ColumnMap, LocatedError } from "@/lib/analysis/types";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys } from "@/lib/api/query-keys";
import { DuplicateLog, uploadBenchLog } from "@/lib/uploads/client";
import { isAcceptedLogFile, maxLogBytes, runPurposes } from "@/lib/validations/runs";
import { ColumnMapEditor } from "./column-map-editor";
import { RunProgress } from "./run-progress";
import { SavedMaps, type SavedMapOption } from "./saved-maps";

/** How many bytes the browser reads to show a preview and detect the columns before upload. */
const previewBytes = 64 * 1024;

type Phase = "checking" | "needs attention" | "ready" | "uploading" | "sent" | "failed";

interface FileItem {
  id: string;
  file: File;
  phase: Phase;
  preview: LogPreview | null;
  map: ColumnMap | null;
  progress: number;
  runId: string | null;
  error: string | null;
  /** The run already stored when the server refused this file as a byte-identical copy. */
  duplicateOf: string | null;
}

const phaseTone: Record<Phase, BadgeTone> = {
  checking: "neutral",
  "needs attention": "warn",
  ready: "accent",
  uploading: "accent",
  sent: "good",
  failed: "bad",
};

export function locatedMessage(fileName: string, error: LocatedError): string {
  const where = [error.line ? `line ${error.line}` : null, error.column ? `column ${error.column}` : null].filter(Boolean).join(", ");
  return `${fileName}${where ? ` (${where})` : ""}: ${error.message}`;
}

function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 / 1024).toFixed(1)} MiB`;
}

async function readPreview(file: File, map?: ColumnMap): Promise<LogPreview> {
  const head = new Uint8Array(await file.slice(0, previewBytes).arrayBuffer());
  return previewLog(head, { columnMap: map, maxRows: 8 });
}

function phaseAfterPreview(preview: LogPreview): Phase {
  if (preview.error) return "needs attention";
  return (preview.detection?.confidence ?? 0) < 0.8 ? "needs attention" : "ready";
}

export interface CellOption {
  serial: string;
}

export function UploadWorkbench({
  canCreateCell,
  batches,
  savedMaps: initialMaps,
}: {
  canCreateCell: boolean;
  batches: { id: string; lotCode: string }[];
  savedMaps: SavedMapOption[];
}) {
  const [savedMaps, setSavedMaps] = useState(initialMaps);
  const queryClient = useQueryClient();
  const formId = useId();
  const fileInput = useRef<HTMLInputElement>(null);
  const [items, setItems] = useState<FileItem[]>([]);
  const [dragging, setDragging] = useState(false);
  const [serial, setSerial] = useState("");
  const [purpose, setPurpose] = useState<(typeof runPurposes)[number]>("capacity check");
  const [ambient, setAmbient] = useState("");
  // datetime-local: the reader's own clock time; sent as an instant so the server never guesses a zone.
  const [testEnded, setTestEnded] = useState("");
  const [note, setNote] = useState("");
  const [batchId, setBatchId] = useState("");
  const [formError, setFormError] = useState<string | null>(null);

  const suggestions = useQuery({
    queryKey: queryKeys.cells.list({ q: serial, pageSize: 8 }),
    queryFn: () => fetchJson<{ items: CellOption[] }>(`/api/cells?q=${encodeURIComponent(serial)}&pageSize=8`),
    enabled: serial.length >= 2,
  });
  const knownSerial = suggestions.data?.items.some((c) => c.serial.toLowerCase() === serial.toLowerCase()) ?? false;

  const update = useCallback((id: string, patch: Partial<FileItem>) => {
    setItems((list) => list.map((item) => (item.id === id ? { ...item, ...patch } : item)));
  }, []);

  const addFiles = useCallback(
    (files: FileList | File[]) => {
      for (const file of Array.from(files)) {
        const id = `${file.name}-${file.size}-${file.lastModified}-${Math.random().toString(36).slice(2, 7)}`;
        const base: FileItem = { id, file, phase: "checking", preview: null, map: null, progress: 0, runId: null, error: null, duplicateOf: null };
        if (!isAcceptedLogFile(file)) {
          setItems((list) => [...list, { ...base, phase: "failed", error: `${file.name}: not a CSV or text log (type "${file.type || "unknown"}"). Export the log as .csv, .txt or .tsv.` }]);
          continue;
        }
        if (file.size > maxLogBytes) {
          setItems((list) => [...list, { ...base, phase: "failed", error: `${file.name}: ${formatBytes(file.size)} is over the ${formatBytes(maxLogBytes)} limit per log. Split the log at a rest step.` }]);
          continue;
        }
        setItems((list) => [...list, base]);
        readPreview(file).then(
          (preview) => update(id, { preview, map: preview.detection?.columnMap ?? null, phase: phaseAfterPreview(preview), error: preview.error ? locatedMessage(file.name, preview.error) : null }),
          (error: unknown) => update(id, { phase: "failed", error: `${file.name}: could not be read (${error instanceof Error ? error.message : String(error)})` }),
        );
      }
    },
    [update],
  );

  async function changeMap(item: FileItem, map: ColumnMap) {
    update(item.id, { map });
    const preview = await readPreview(item.file, map);
    update(item.id, { preview, phase: preview.error ? "needs attention" : "ready", error: preview.error ? locatedMessage(item.file.name, preview.error) : null });
  }

  async function send(item: FileItem) {
    if (!serial.trim()) {
      setFormError("Enter the cell's serial before uploading.");
      return;
    }
    setFormError(null);
    update(item.id, { phase: "uploading", progress: 0, error: null });
    try {
      const runId = await uploadBenchLog(item.file, {
        cellSerial: serial.trim(),
        purpose,
        ambientTempC: ambient.trim() === "" ? undefined : Number(ambient.replace(",", ".")),
        testEndedAt: testEnded ? new Date(testEnded).toISOString() : undefined,
        operatorNote: note,
        columnMap: item.map ?? undefined,
        batchId: !knownSerial && batchId ? batchId : undefined,
      }, (progress) => update(item.id, { progress }));
      update(item.id, { phase: "sent", runId, progress: 100 });
      void queryClient.invalidateQueries({ queryKey: queryKeys.cells.all });
    } catch (error) {
      update(item.id, {
        phase: "failed",
        error: `${item.file.name}: ${error instanceof Error ? error.message : String(error)}`,
        duplicateOf: error instanceof DuplicateLog ? error.runId : null,
      });
    }
  }

  const ready = items.filter((i) => i.phase === "ready");

  function onDrop(event: DragEvent<HTMLDivElement>) {
    event.preventDefault();
    setDragging(false);
    if (event.dataTransfer.files.length) addFiles(event.dataTransfer.files);
  }

  return (
    <div className="space-y-6">
      <Panel title="1 · Which cell and which test">
        <div className="grid gap-4 md:grid-cols-2">
          <div>
            <TextField
              label="Cell serial"
              name="cellSerial"
              list={`${formId}-serials`}
              value={serial}
              onChange={(e) => setSerial(e.target.value)}
              autoComplete="off"
              required
              hint={
                serial.length < 2 || !suggestions.isSuccess
                  ? "Start typing to pick a registered cell."
                  : knownSerial
                    ? "A registered cell: the run will be filed under it."
                    : canCreateCell
                      ? "New serial: the cell will be registered with this upload."
                      : "This serial is not registered and your role cannot register cells."
              }
            />
            <datalist id={`${formId}-serials`}>
              {suggestions.data?.items.map((c) => (
                <option key={c.serial} value={c.serial} />
              ))}
            </datalist>
          </div>
          <SelectField label="Test purpose" name="purpose" value={purpose} onChange={(e) => setPurpose(e.target.value as (typeof runPurposes)[number])}>
            {runPurposes.map((p) => (
              <option key={p} value={p}>
                {p}
              </option>
            ))}
          </SelectField>
          {serial.length >= 2 && suggestions.isSuccess && !knownSerial && canCreateCell ? (
            <SelectField label="Batch of the new cell" name="batchId" value={batchId} onChange={(e) => setBatchId(e.target.value)} hint="The new cell takes the batch's cell type.">
              <option value="">Choose…</option>
              {batches.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.lotCode}
                </option>
              ))}
            </SelectField>
          ) : null}
          <TextField label="Ambient temperature (°C)" name="ambientTempC" inputMode="decimal" value={ambient} onChange={(e) => setAmbient(e.target.value)} />
          <TextField
            label="Test ended at"
            name="testEndedAt"
            type="datetime-local"
            value={testEnded}
            onChange={(e) => setTestEnded(e.target.value)}
            hint="Your local time. Leave empty if the test has just ended; fade by date uses this time."
          />
          <div className="md:col-span-2">
            <TextAreaField label="Operator note" name="operatorNote" rows={2} value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} />
          </div>
        </div>
        {formError ? (
          <p role="alert" className="mt-3 text-sm font-medium text-danger">
            {formError}
          </p>
        ) : null}
      </Panel>

      <Panel title="2 · Bench logs">
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={`flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-6 py-10 text-center ${dragging ? "border-copper bg-copper-wash" : "border-rule-strong bg-paper"}`}
        >
          <p className="text-sm text-ink">Drop CSV, TXT or TSV logs here (up to {formatBytes(maxLogBytes)} each, several at once)</p>
          <Button onClick={() => fileInput.current?.click()}>Choose files…</Button>
          <input
            ref={fileInput}
            type="file"
            multiple
            accept=".csv,.txt,.tsv,.bdf,text/csv,text/plain,text/tab-separated-values"
            className="sr-only"
            aria-label="Choose bench log files"
            data-testid="log-file-input"
            onChange={(e) => {
              if (e.target.files) addFiles(e.target.files);
              e.target.value = "";
            }}
          />
        </div>
        {ready.length > 1 ? (
          <div className="mt-4">
            <Button tone="primary" onClick={() => ready.forEach((item) => void send(item))}>
              Upload and analyse all {ready.length} ready logs
            </Button>
          </div>
        ) : null}
        <ul className="mt-4 space-y-4" aria-live="polite">
          {items.map((item) => (
            <li key={item.id} className="rounded-lg border border-rule bg-white p-4" data-testid="upload-item">
              <div className="flex flex-wrap items-center justify-between gap-2">
                <p className="font-medium">
                  {item.file.name} <span className="text-sm font-normal text-ink-soft">· {formatBytes(item.file.size)}</span>
                </p>
                <Badge tone={phaseTone[item.phase]}>{item.phase === "uploading" ? `uploading ${Math.round(item.progress)} %` : item.phase}</Badge>
              </div>
              {item.error ? (
                <p role="alert" className="mt-2 rounded bg-danger-wash px-3 py-2 text-sm text-danger">
                  {item.error}
                  {item.duplicateOf ? (
                    <>
                      {" "}
                      <Link className="font-medium underline" href={`/runs/${item.duplicateOf}`}>
                        Open the run already stored
                      </Link>
                    </>
                  ) : null}
                </p>
              ) : null}
              {item.phase === "uploading" ? (
                <div className="mt-3 h-2 overflow-hidden rounded bg-rule" role="progressbar" aria-valuenow={Math.round(item.progress)} aria-valuemin={0} aria-valuemax={100} aria-label={`Uploading ${item.file.name}`}>
                  <div className="h-full bg-copper transition-all" style={{ width: `${item.progress}%` }} />
                </div>
              ) : null}
              {item.preview && item.map && (item.phase === "ready" || item.phase === "needs attention") ? (
                <div className="mt-3 space-y-3">
                  {item.preview.detection ? (
                    <p className="text-sm text-ink-soft">
                      Detected: {item.preview.detection.delimiter === "\t" ? "tab" : `"${item.preview.detection.delimiter}"`}-separated, decimal &quot;{item.preview.detection.decimal}&quot;, header on line {item.preview.detection.headerLine},
                      confidence {Math.round(item.preview.detection.confidence * 100)} %.
                      {item.preview.detection.confidence < 0.8 ? " Please check the columns below before uploading." : " Check the columns below, then upload."}
                    </p>
                  ) : null}
                  <PreviewTable preview={item.preview} map={item.map} />
                  <ColumnMapEditor header={item.preview.header} map={item.map} idPrefix={item.id} onChange={(map) => void changeMap(item, map)} />
                  <SavedMaps
                    idPrefix={item.id}
                    maps={savedMaps}
                    map={item.map}
                    onApply={(map) => void changeMap(item, map)}
                    onSaved={(saved) => setSavedMaps((list) => [saved, ...list.filter((m) => m.name !== saved.name)])}
                  />
                  <div className="flex flex-wrap gap-2">
                    <Button tone="primary" disabled={item.phase !== "ready"} onClick={() => void send(item)}>
                      Upload and analyse
                    </Button>
                    <Button onClick={() => setItems((list) => list.filter((i) => i.id !== item.id))}>Remove</Button>
                  </div>
                </div>
              ) : null}
              {item.phase === "sent" && item.runId ? <RunProgress runId={item.runId} /> : null}
            </li>
          ))}
        </ul>
      </Panel>
      {items.some((i) => i.phase === "sent") ? (
        <p className="text-sm text-ink-soft">
          Uploaded logs keep analysing if you leave this page; find them under the cell&apos;s serial on{" "}
          <Link className="underline" href="/cells">
            Cells
          </Link>
          .
        </p>
      ) : null}
    </div>
  );
}

function PreviewTable({ preview, map }: { preview: LogPreview; map: ColumnMap }) {
  const roleOf = new Map<number, string>();
  roleOf.set(map.time.index, "time");
  roleOf.set(map.voltage.index, "voltage");
  roleOf.set(map.current.index, "current");
  if (map.temperature) roleOf.set(map.temperature.index, "temperature");
  if (map.mode) roleOf.set(map.mode.index, "mode");
  if (map.step) roleOf.set(map.step.index, "step");
  if (map.cycle) roleOf.set(map.cycle.index, "cycle");
  return (
    <div className="overflow-x-auto rounded border border-rule">
      <table className="min-w-full font-mono text-xs">
        <caption className="sr-only">First rows of the log</caption>
        <thead className="bg-paper">
          <tr>
            {preview.header.map((h, i) => (
              <th key={i} scope="col" className="border-b border-rule px-2 py-1 text-left font-medium">
                <span className="block">{h || `column ${i + 1}`}</span>
                {roleOf.has(i) ? <span className="block text-[10px] uppercase tracking-wide text-copper-dark">{roleOf.get(i)}</span> : <span className="block text-[10px] text-ink-soft">not used</span>}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((row, r) => (
            <tr key={r} className="border-b border-rule/50 last:border-0">
              {row.map((cell, c) => (
                <td key={c} className={`px-2 py-0.5 ${roleOf.has(c) ? "" : "text-ink-soft"}`}>
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
