import { lazy, Suspense, useState } from "react";
import { cx } from "~/components/ui";

type Photo = { id: string; thumbnailUrl: string; largeUrl: string; width: number; height: number; caption: string | null };

// Fetched on first use: the viewer and its zoom are not part of the listing page's script.
const PhotoLightbox = lazy(() => import("./photo-lightbox"));

/** The large view with a strip of thumbnails; without JavaScript each thumbnail opens its large image. */
export function PhotoGallery({ photos, title }: { photos: Photo[]; title: string }) {
  const [selected, setSelected] = useState(0);
  const [viewing, setViewing] = useState(false);
  if (!photos.length) {
    return <div className="flex aspect-[4/3] items-center justify-center rounded-panel bg-ink-100 text-ink-500">No photos yet</div>;
  }
  const current = photos[Math.min(selected, photos.length - 1)];
  return (
    <div className="space-y-3">
      <figure>
        <div className="relative overflow-hidden rounded-panel border border-ink-200 bg-ink-950">
          <img
            src={current.largeUrl}
            alt={`${title}, photo ${selected + 1} of ${photos.length}`}
            width={current.width}
            height={current.height}
            className="mx-auto aspect-[4/3] w-full object-contain"
          />
          <button
            type="button"
            onClick={() => setViewing(true)}
            className="absolute bottom-3 right-3 rounded-control bg-white/90 px-3 py-1.5 text-sm font-semibold text-ink-900 shadow-xs hover:bg-white focus:outline-none focus:ring-2 focus:ring-brass-400"
          >
            Enlarge and zoom
          </button>
        </div>
        {current.caption ? <figcaption className="mt-2 text-sm text-ink-700">{current.caption}</figcaption> : null}
      </figure>
      {viewing ? (
        <Suspense fallback={null}>
          <PhotoLightbox
            photos={photos}
            index={Math.min(selected, photos.length - 1)}
            title={title}
            onClose={(index) => {
              setSelected(index);
              setViewing(false);
            }}
          />
        </Suspense>
      ) : null}
      {photos.length > 1 ? (
        <ul className="grid grid-cols-4 gap-2 sm:grid-cols-6" aria-label="All photos">
          {photos.map((photo, index) => (
            <li key={photo.id}>
              <a
                href={photo.largeUrl}
                onClick={(event) => {
                  event.preventDefault();
                  setSelected(index);
                }}
                aria-label={`Show photo ${index + 1}`}
                aria-current={index === selected ? "true" : undefined}
                className={cx(
                  "block overflow-hidden rounded-control ring-2 ring-offset-1",
                  index === selected ? "ring-brass-500" : "ring-transparent hover:ring-ink-300",
                )}
              >
                <img src={photo.thumbnailUrl} alt="" width={480} height={360} className="aspect-[4/3] w-full object-cover" loading="lazy" />
              </a>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
