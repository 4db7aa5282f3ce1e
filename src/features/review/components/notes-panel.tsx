import { type FormEvent, type RefObject, useState } from 'react';
import { NOTE_MAX_LENGTH, type Note } from '@shared/schemas/review';
import { Button, Notice, describeError } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import { useCreateNote } from '../api/create-note';

export function NotesPanel({
  matterId,
  docId,
  notes,
  canAdd,
  inputRef,
}: {
  matterId: number;
  docId: number;
  notes: Note[];
  canAdd: boolean;
  inputRef: RefObject<HTMLTextAreaElement | null>;
}) {
  const [body, setBody] = useState('');
  const create = useCreateNote(matterId, docId);

  function submit(event: FormEvent) {
    event.preventDefault();
    const text = body.trim();
    if (!text) return;
    create.mutate(text, { onSuccess: () => setBody('') });
  }

  return (
    <section
      className="rounded-md border border-line bg-panel p-3"
      aria-labelledby="notes-heading"
      data-testid="notes-panel"
    >
      <h2 id="notes-heading" className="mb-2 text-sm font-semibold">
        Notes <span className="font-normal text-ink-faint">({notes.length})</span>
      </h2>
      {notes.length > 0 ? (
        <ul className="mb-2 space-y-2 text-[13px]">
          {notes.map((note) => (
            <li key={note.id} className="border-l-2 border-line-strong pl-2" data-testid="note">
              <p className="whitespace-pre-wrap">{note.body}</p>
              <p className="text-[11px] text-ink-faint">
                {note.author?.name ?? 'Former member'} · {formatDateTime(note.createdAt)}
              </p>
            </li>
          ))}
        </ul>
      ) : null}
      {canAdd ? (
        <form onSubmit={submit} className="space-y-1.5">
          <label htmlFor={`note-${docId}`} className="sr-only">
            New note
          </label>
          <textarea
            id={`note-${docId}`}
            ref={inputRef}
            rows={2}
            value={body}
            maxLength={NOTE_MAX_LENGTH}
            onChange={(event) => setBody(event.target.value)}
            onKeyDown={(event) => {
              if (event.key === 'Enter' && (event.ctrlKey || event.metaKey)) submit(event);
              if (event.key === 'Escape') event.currentTarget.blur();
            }}
            placeholder="Add a note for the team (Ctrl+Enter saves, Esc leaves the box)"
            className="block w-full rounded-md border border-line-strong bg-panel px-2.5 py-1.5 text-[13px]"
            data-testid="note-input"
          />
          {create.isError ? (
            <Notice tone="danger" title="The note was not saved">
              {describeError(create.error)}
            </Notice>
          ) : null}
          <Button
            type="submit"
            size="sm"
            busy={create.isPending}
            disabled={!body.trim()}
            data-testid="note-save"
          >
            Add note
          </Button>
        </form>
      ) : null}
    </section>
  );
}
