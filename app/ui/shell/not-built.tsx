import type { Area } from './areas.js';

/** Says plainly that an area is not built yet: no sample data, no buttons that do nothing. */
export function NotBuilt({ area }: { readonly area: Area }) {
  return (
    <section className="screen" aria-labelledby={`${area.id}-title`}>
      <h1 id={`${area.id}-title`}>{area.title}</h1>
      <div className="not-built" role="note">
        <p>
          <strong>Not built yet in this version.</strong> This area will hold {area.purpose}.
        </p>
        <p>Nothing here is stored or shown until it is built.</p>
      </div>
    </section>
  );
}
