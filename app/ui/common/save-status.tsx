/** The outcome of a save, export or removal, shown beside the button that did it. */
export type SaveMessage = { readonly kind: 'saved' | 'failed'; readonly text: string };

/** Announces a save's outcome (polite status); nothing while there is none. */
export function SaveStatus({ message }: { readonly message: SaveMessage | null }) {
  if (message === null) return null;
  return (
    <p className={message.kind === 'saved' ? 'status-saved' : 'form-error'} role="status">
      {message.text}
    </p>
  );
}
