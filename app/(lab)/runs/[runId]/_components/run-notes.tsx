"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useRef, useState, useTransition } from "react";
import { Button } from "@/components/ui/button";
import { TextAreaField } from "@/components/ui/field";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys } from "@/lib/api/query-keys";
import type { ActionResult } from "@/lib/auth/action-result";
import { threadNotes, type NoteEntry } from "@/lib/notebook/notes";
import { maxNoteLength } from "@/lib/validations/notebook";
import { addRunNoteAction } from "../actions";

function when(iso: string): string {
  return `${iso.slice(0, 16).replace("T", " ")} UTC`;
}

/**
 * The run's notebook: every note as written, oldest first. An amendment is a new note; the note
 * it corrects stays visible, struck through, with a pointer to its correction.
 */
export function RunNotes({ runId, initial, canWrite }: { runId: string; initial: NoteEntry[]; canWrite: boolean }) {
  const client = useQueryClient();
  const query = useQuery({
    queryKey: queryKeys.runs.notes(runId),
    queryFn: () => fetchJson<{ items: NoteEntry[] }>(`/api/runs/${runId}/notes`).then((r) => r.items),
    initialData: initial,
  });
  const [text, setText] = useState("");
  const [amends, setAmends] = useState<NoteEntry | null>(null);
  const [result, setResult] = useState<ActionResult<NoteEntry> | null>(null);
  const [pending, start] = useTransition();
  const form = useRef<HTMLFormElement>(null);
  const notes = threadNotes(query.data ?? []);

  const submit = () =>
    start(async () => {
      const outcome = await addRunNoteAction({ runId, text, amends: amends ? String(amends.id) : undefined });
      setResult(outcome);
      if (outcome.ok) {
        setText("");
        setAmends(null);
        await client.invalidateQueries({ queryKey: queryKeys.runs.notes(runId) });
      }
    });

  return (
    <div className="space-y-4">
      {query.error ? (
        <p role="alert" className="text-sm text-danger">
          Could not load the notes: {query.error.message}{" "}
          <button type="button" onClick={() => void query.refetch()} className="underline">
            Try again
          </button>
        </p>
      ) : null}
      {notes.length === 0 ? (
        <p className="text-sm text-ink-soft">No notes yet. Write down what the log cannot tell: the fixture, the bench, anything you saw or smelled during the test.</p>
      ) : (
        <ol className="space-y-3">
          {notes.map((n) => (
            <li key={n.id} id={`note-${n.id}`} className="rounded-md border border-rule bg-paper/60 px-4 py-3">
              <p className="text-xs text-ink-soft">
                <span className="font-semibold text-ink">{n.authorName}</span> · {when(n.at)} · note {n.id}
                {n.amendsNote ? (
                  <>
                    {" "}
                    · amends{" "}
                    <a href={`#note-${n.amendsNote.id}`} className="underline">
                      note {n.amendsNote.id}
                    </a>
                  </>
                ) : null}
              </p>
              <p className={`mt-1 whitespace-pre-wrap text-sm ${n.amendedBy.length ? "text-ink-soft line-through" : "text-ink"}`}>{n.text}</p>
              {n.amendedBy.length ? (
                <p className="mt-1 text-xs text-ink-soft">
                  Amended by{" "}
                  {n.amendedBy.map((id, i) => (
                    <span key={id}>
                      {i > 0 ? ", " : ""}
                      <a href={`#note-${id}`} className="underline">
                        note {id}
                      </a>
                    </span>
                  ))}
                  ; kept as written.
                </p>
              ) : null}
              {canWrite ? (
                <button
                  type="button"
                  onClick={() => {
                    setAmends(n);
                    form.current?.querySelector("textarea")?.focus();
                  }}
                  className="no-print mt-1 text-xs font-medium text-copper-dark underline-offset-2 hover:underline"
                >
                  Amend this note
                </button>
              ) : null}
            </li>
          ))}
        </ol>
      )}
      {canWrite ? (
        <form
          ref={form}
          className="no-print space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            submit();
          }}
        >
          {amends ? (
            <p className="flex flex-wrap items-center gap-2 text-sm">
              Amending note {amends.id} by {amends.authorName}. The original stays as it was written.
              <button type="button" onClick={() => setAmends(null)} className="text-xs underline">
                Write a new note instead
              </button>
            </p>
          ) : null}
          <TextAreaField
            label={amends ? "Amendment" : "New note"}
            rows={3}
            maxLength={maxNoteLength}
            value={text}
            onChange={(e) => setText(e.target.value)}
            hint={`Notes cannot be edited or deleted, only amended. Up to ${maxNoteLength} characters.`}
            errors={result && !result.ok ? (result.fieldErrors?.text ?? result.fieldErrors?.amends) : undefined}
          />
          <div className="flex items-center gap-3">
            <Button type="submit" tone="primary" disabled={pending || text.trim() === ""}>
              {pending ? "Saving…" : amends ? "Add amendment" : "Add note"}
            </Button>
            {result && !result.ok && !result.fieldErrors ? (
              <p role="alert" className="text-sm text-danger">
                {result.error}
              </p>
            ) : null}
            {result?.ok ? (
              <p role="status" className="text-sm text-ok">
                Note {result.data.id} saved.
              </p>
            ) : null}
          </div>
        </form>
      ) : null}
    </div>
  );
}
