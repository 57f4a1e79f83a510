"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useId, useMemo, useState, useTransition, type ChangeEvent } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField } from "@/components/ui/field";
import { Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { queryKeys } from "@/lib/api/query-keys";
import type { ActionResult } from "@/lib/auth/action-result";
import { problemsByLine, readSerialList, type SerialLine, type SerialListChoice } from "@/lib/registry/serial-list";
import { serialImportInput } from "@/lib/validations/registry";
import { importSerialsAction } from "../actions";

const previewLines = 8;
const listedProblems = 50;
const maxFileBytes = 5 * 1024 * 1024;

type Outcome = ActionResult<{ created: number }>;

/**
 * What the server's schema says about the list as a whole (too many serials, for one); problems of
 * single serials are already on their lines.
 */
function wholeListProblems(serials: string[]): string[] {
  const parsed = serialImportInput.shape.serials.safeParse(serials);
  return parsed.success ? [] : parsed.error.issues.filter((issue) => issue.path.length === 0).map((issue) => issue.message);
}

export function SerialImport({ batchId, lotCode, expected }: { batchId: string; lotCode: string; expected: number }) {
  const queryClient = useQueryClient();
  const fileInputId = useId();
  const [text, setText] = useState("");
  const [source, setSource] = useState<string | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [choice, setChoice] = useState<SerialListChoice>({});
  // The server's answer belongs to the list it was given; any edit makes it stale.
  const [answer, setAnswer] = useState<{ submitted: SerialLine[]; outcome: Outcome } | null>(null);
  const [fileInputKey, setFileInputKey] = useState(0);
  const [pending, startTransition] = useTransition();

  const list = useMemo(() => (text.trim() ? readSerialList(text, choice) : null), [text, choice]);
  const serials = list?.lines.map((l) => l.serial) ?? [];
  const whole = useMemo(() => (list ? wholeListProblems(list.lines.map((l) => l.serial)) : []), [list]);
  const failed = answer && !answer.outcome.ok ? answer.outcome : null;
  const fromServer = failed ? problemsByLine(failed.fieldErrors ?? {}, answer?.submitted ?? []) : null;
  const problemsOf = (line: SerialLine) => [...line.problems, ...(fromServer?.byLine.get(line.line) ?? [])];
  const problemLines = list?.lines.filter((l) => problemsOf(l).length > 0) ?? [];
  const general = [...(list?.fileProblems ?? []), ...whole, ...(fromServer?.general ?? [])];
  const ready = Boolean(list && serials.length > 0 && problemLines.length === 0 && general.length === 0);

  function choose(next: SerialListChoice) {
    setChoice(next);
    setAnswer(null);
  }

  function changeText(next: string, from: string | null) {
    setText(next);
    setSource(from);
    choose({});
  }

  async function chooseFile(event: ChangeEvent<HTMLInputElement>) {
    const file = event.target.files?.[0];
    setFileError(null);
    if (!file) return;
    if (file.size > maxFileBytes) {
      setFileError(`${file.name} is larger than 5 MB; a serial list is much smaller. Is it the right file?`);
      return;
    }
    changeText(await file.text(), file.name);
  }

  function submit() {
    if (!list || !ready) return;
    const submitted = list.lines;
    startTransition(async () => {
      const outcome = await importSerialsAction({ batchId, serials: submitted.map((l) => l.serial) });
      setAnswer({ submitted, outcome });
      if (outcome.ok) {
        setText("");
        setSource(null);
        setFileInputKey((k) => k + 1);
        void queryClient.invalidateQueries({ queryKey: queryKeys.cells.all });
      }
    });
  }

  return (
    <Panel title="Import the serial list">
      <div className="space-y-4">
        <p className="text-sm text-ink-soft">
          Choose the CSV file that came with lot <span className="font-mono">{lotCode}</span>, or paste the serials, one per line. The serial column is
          found by its header (Serial, Serial number, S/N or ID); without one, the first column is used. Nothing is registered until every line is
          right.
        </p>
        <div className="space-y-1">
          <label htmlFor={fileInputId} className="block text-sm font-medium">
            CSV or text file
          </label>
          <input
            key={fileInputKey}
            id={fileInputId}
            type="file"
            accept=".csv,.txt,.tsv,text/csv,text/plain,text/tab-separated-values"
            onChange={(e) => void chooseFile(e)}
            className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-rule-strong file:bg-sheet file:px-3 file:py-2 file:text-sm file:font-medium hover:file:bg-paper"
          />
          {fileError ? (
            <p role="alert" className="text-xs font-medium text-danger">
              {fileError}
            </p>
          ) : null}
        </div>
        <TextAreaField
          label={source ? `Contents of ${source}` : "Or paste the list"}
          value={text}
          onChange={(e) => changeText(e.target.value, null)}
          rows={6}
          spellCheck={false}
          className="font-mono"
          placeholder={"Serial\nKP-24-0001\nKP-24-0002"}
        />

        {list ? (
          <>
            <div className="grid grid-cols-2 gap-3">
              <SelectField label="Serial column" value={list.column} onChange={(e) => choose({ ...choice, column: Number(e.target.value) })}>
                {list.columns.map((name, i) => (
                  <option key={i} value={i}>
                    {name}
                  </option>
                ))}
              </SelectField>
              <label className="flex items-end gap-2 pb-2 text-sm">
                <input
                  type="checkbox"
                  checked={list.hasHeader}
                  onChange={(e) => choose({ ...choice, hasHeader: e.target.checked })}
                  className="size-4 accent-copper"
                />
                Line 1 is a header
              </label>
            </div>

            <p role="status" className="text-sm">
              {serials.length} {serials.length === 1 ? "serial" : "serials"}
              {list.blankLines ? `, ${list.blankLines} blank ${list.blankLines === 1 ? "line" : "lines"} skipped` : ""}
              {problemLines.length ? `; ${problemLines.length} ${problemLines.length === 1 ? "line needs" : "lines need"} attention` : ""}.
              {expected > 0 && serials.length !== expected ? (
                <span className="mt-1 block text-warn">
                  The batch has {expected} {expected === 1 ? "cell" : "cells"} still to register; this list has {serials.length}.
                </span>
              ) : null}
            </p>

            {failed || general.length || problemLines.length ? (
              <div role="alert" className="rounded-md border border-danger/40 bg-danger-wash p-3 text-sm text-danger">
                {failed ? <p className="mb-1 font-medium">{failed.error}</p> : null}
                <ul className="list-inside list-disc space-y-0.5">
                  {general.map((message) => (
                    <li key={message}>{message}</li>
                  ))}
                  {problemLines.slice(0, listedProblems).map((line) => (
                    <li key={line.line}>
                      Line {line.line}
                      {line.serial ? (
                        <>
                          {" "}
                          (<span className="font-mono">{line.serial}</span>)
                        </>
                      ) : null}
                      : {problemsOf(line).join("; ")}
                    </li>
                  ))}
                </ul>
                {problemLines.length > listedProblems ? <p className="mt-1">…and {problemLines.length - listedProblems} more lines.</p> : null}
              </div>
            ) : null}

            <div className="overflow-x-auto rounded-md border border-rule">
              <SimpleTable caption="First lines of the list" headers={headersOf("Line#", "Serial", "Check")}>
                {list.lines.slice(0, previewLines).map((line) => {
                  const problems = problemsOf(line);
                  return (
                    <tr key={line.line} className={problems.length ? "bg-danger-wash" : ""}>
                      <td className={`${cellClass(true)} text-ink-soft`}>{line.line}</td>
                      <td className={`${cellClass()} font-mono`}>{line.serial || <span className="text-ink-soft">(empty)</span>}</td>
                      <td className={`${cellClass()} ${problems.length ? "text-danger" : "text-ok"}`}>{problems.length ? problems.join("; ") : "ok"}</td>
                    </tr>
                  );
                })}
              </SimpleTable>
              {list.lines.length > previewLines ? (
                <p className="border-t border-rule/60 px-3 py-1.5 text-xs text-ink-soft">…and {list.lines.length - previewLines} more lines.</p>
              ) : null}
            </div>
          </>
        ) : null}

        {answer?.outcome.ok ? (
          <p role="status" className="text-sm text-ok">
            Registered {answer.outcome.data.created} cells in lot <span className="font-mono">{lotCode}</span>.
          </p>
        ) : null}
        <Button tone="primary" onClick={submit} disabled={!ready || pending}>
          {pending ? "Registering…" : serials.length ? `Register ${serials.length} ${serials.length === 1 ? "cell" : "cells"}` : "Register cells"}
        </Button>
      </div>
    </Panel>
  );
}
