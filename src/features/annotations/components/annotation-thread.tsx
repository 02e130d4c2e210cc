import { useId, useRef } from 'react';
import { CreateReplyInputSchema, type Annotation } from '@shared/schemas/annotations';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Form, FormActions, useZodForm } from '@/components/ui/form';
import { FormError } from '@/components/ui/form-error';
import { controlClass } from '@/components/ui/input';
import { useCan } from '@/lib/authorization';
import { cn } from '@/lib/cn';
import { useAddReply, useUpdateAnnotation, useUploadAttachment } from '../api/write-annotation';
import { Byline, StatusBadge, pinText } from './annotation-meta';

const MAX_IMAGE_MB = 5;

const sizeText = (bytes: number) =>
  bytes < 1024
    ? `${bytes} B`
    : bytes < 1024 * 1024
      ? `${(bytes / 1024).toFixed(0)} KB`
      : `${(bytes / 1024 / 1024).toFixed(1)} MB`;

function ReplyForm({ annotationId }: { annotationId: number }) {
  const form = useZodForm(CreateReplyInputSchema, { defaultValues: { body: '' } });
  const { register, reset, formState } = form;
  const reply = useAddReply({ onSuccess: () => reset() });
  return (
    <Form form={form} className="space-y-2" onSubmit={(data) => reply.mutate({ id: annotationId, data })}>
      <FormError error={reply.error} fallback="The reply could not be saved." />
      <Field label="Reply" error={formState.errors.body?.message}>
        <textarea rows={3} className={cn(controlClass, 'py-2')} {...register('body')} />
      </Field>
      <FormActions submit="Add reply" size="sm" isLoading={reply.isPending} />
    </Form>
  );
}

function AttachImage({ annotationId }: { annotationId: number }) {
  const inputId = useId();
  const input = useRef<HTMLInputElement>(null);
  const upload = useUploadAttachment({
    onSuccess: () => {
      if (input.current) input.current.value = '';
    },
  });
  return (
    <div className="space-y-1.5">
      <label htmlFor={inputId} className="block text-sm font-medium text-text-strong">
        Attach an image
      </label>
      <input
        id={inputId}
        ref={input}
        type="file"
        accept="image/png,image/jpeg"
        aria-describedby={`${inputId}-hint`}
        disabled={upload.isPending}
        className={cn(
          'block w-full text-sm file:mr-3 file:rounded-md file:border file:border-surface-line file:bg-surface-panel file:px-3 file:py-1.5 file:text-sm file:font-medium',
          'rounded-md focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent',
        )}
        onChange={(e) => {
          const file = e.target.files?.[0];
          if (file) upload.mutate({ id: annotationId, file });
        }}
      />
      <p id={`${inputId}-hint`} className="text-xs text-text-muted">
        PNG or JPEG, up to {MAX_IMAGE_MB} MB; the server checks the file's content, not its name.
        {upload.isPending && ' Uploading…'}
      </p>
      <FormError error={upload.error} fallback="The image could not be attached." />
    </div>
  );
}

interface AnnotationThreadProps {
  annotation: Annotation;
  onBack: () => void;
}

export function AnnotationThread({ annotation: a, onBack }: AnnotationThreadProps) {
  const canWrite = useCan('annotations:write');
  const update = useUpdateAnnotation();
  const resolved = a.status === 'resolved';
  return (
    <article className="space-y-4" aria-labelledby={`note-${a.id}-title`}>
      <Button size="sm" variant="ghost" onClick={onBack}>
        ← All notes
      </Button>
      <header className="space-y-1">
        <div className="flex items-start justify-between gap-2">
          <h3 id={`note-${a.id}-title`} className="text-base font-semibold text-text-strong">
            {a.title}
          </h3>
          <StatusBadge status={a.status} />
        </div>
        <Byline name={a.author?.name} at={a.createdAt} />
        <p className="text-xs text-text">
          Pinned to <span className="font-mono">{pinText(a)}</span>
          {resolved && a.resolvedBy && ` · resolved by ${a.resolvedBy.name}`}
        </p>
      </header>
      {a.body && <p className="text-sm whitespace-pre-wrap text-text">{a.body}</p>}

      {a.attachments.length > 0 && (
        <ul className="grid grid-cols-2 gap-2" aria-label="Images">
          {a.attachments.map((f) => (
            <li key={f.id}>
              <a
                href={f.url}
                target="_blank"
                rel="noreferrer"
                className="block rounded focus-visible:outline-2 focus-visible:outline-accent"
              >
                <img
                  src={f.url}
                  alt={f.fileName}
                  className="max-h-40 w-full rounded border border-surface-line object-contain"
                />
              </a>
              <p className="mt-0.5 truncate text-xs text-text-muted" title={f.fileName}>
                {f.fileName} · {sizeText(f.sizeBytes)}
              </p>
            </li>
          ))}
        </ul>
      )}

      {canWrite && (
        <div className="space-y-2">
          <FormError error={update.error} fallback="The note could not be changed." />
          <Button
            size="sm"
            variant="secondary"
            isLoading={update.isPending}
            onClick={() => update.mutate({ id: a.id, data: { status: resolved ? 'open' : 'resolved' } })}
          >
            {resolved ? 'Reopen' : 'Resolve'}
          </Button>
        </div>
      )}

      <section aria-label="Replies" className="space-y-2">
        <h4 className="text-sm font-semibold text-text-strong">
          {a.replies.length} {a.replies.length === 1 ? 'reply' : 'replies'}
        </h4>
        <ol className="space-y-2">
          {a.replies.map((r) => (
            <li key={r.id} className="rounded-md bg-surface-sunken px-3 py-2">
              <Byline name={r.author?.name} at={r.createdAt} />
              <p className="mt-0.5 text-sm whitespace-pre-wrap text-text">{r.body}</p>
            </li>
          ))}
        </ol>
      </section>

      {canWrite && (
        <>
          <AttachImage annotationId={a.id} />
          <ReplyForm annotationId={a.id} />
        </>
      )}
    </article>
  );
}
