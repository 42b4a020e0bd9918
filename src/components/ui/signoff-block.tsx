import type { SignoffBlock as Block } from '../../../shared/schemas/signoff';

const STATUS_TEXT: Record<Block['status'], string> = {
  none: 'Not reviewed: no one has signed this result off.',
  ready: 'Ready for review: waiting for the lab manager\'s sign-off.',
  signed: 'Signed off.',
  superseded: 'Changed since it was signed: the earlier sign-off no longer holds and a new one is needed.',
};

/** The sign-off block of a report: who signed the result, when and with what comment, or why no one has; then earlier sign-offs. */
export function SignoffBlockView({ block, formatTime }: { block: Block; formatTime: (iso: string) => string }) {
  return (
    <section aria-labelledby="signoff-block-heading" className="rounded-lg border border-line p-4">
      <h2 id="signoff-block-heading" className="font-semibold">
        Sign-off
      </h2>
      <p className="mt-1 text-sm">{STATUS_TEXT[block.status]}</p>
      {block.signed && (
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-ink-muted">Signed by</dt>
          <dd>{block.signed.byName}</dd>
          <dt className="text-ink-muted">When</dt>
          <dd>{formatTime(block.signed.at)}</dd>
          <dt className="text-ink-muted">Comment</dt>
          <dd className="whitespace-pre-wrap">{block.signed.comment}</dd>
          <dt className="text-ink-muted">Content hash</dt>
          <dd className="num break-all text-xs">SHA-256 {block.signed.contentHash}</dd>
        </dl>
      )}
      {block.earlier && block.earlier.length > 0 && (
        <>
          <h3 className="mt-3 text-sm font-semibold">Earlier sign-offs</h3>
          <ul className="mt-1 grid gap-1 text-sm" aria-label="Earlier sign-offs">
            {block.earlier.map((e) => (
              <li key={e.id}>
                {e.byName}, {formatTime(e.at)}, no longer holds: <span className="whitespace-pre-wrap">{e.comment}</span>
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
