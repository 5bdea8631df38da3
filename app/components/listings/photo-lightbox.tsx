// The full-screen photo viewer with zoom and captions. Loaded only when a buyer opens it (React.lazy in
// photo-gallery.tsx), so the listing page's own script stays its size. Keyboard: arrows move, Escape
// closes, + and − zoom (the package's own handling).
import Lightbox from "yet-another-react-lightbox";
import Captions from "yet-another-react-lightbox/plugins/captions";
import Zoom from "yet-another-react-lightbox/plugins/zoom";
import "yet-another-react-lightbox/styles.css";
import "yet-another-react-lightbox/plugins/captions.css";

export type LightboxPhoto = { largeUrl: string; width: number; height: number; caption: string | null };

export default function PhotoLightbox({ photos, index, title, onClose }: { photos: LightboxPhoto[]; index: number; title: string; onClose: (index: number) => void }) {
  let shown = index;
  return (
    <Lightbox
      open
      index={index}
      close={() => onClose(shown)}
      on={{ view: ({ index: current }) => (shown = current) }}
      plugins={[Zoom, Captions]}
      zoom={{ maxZoomPixelRatio: 3, scrollToZoom: true }}
      captions={{ descriptionTextAlign: "center" }}
      labels={{ Close: "Close the photos", Previous: "Previous photo", Next: "Next photo", "Zoom in": "Zoom in", "Zoom out": "Zoom out" }}
      slides={photos.map((photo, number) => ({
        src: photo.largeUrl,
        width: photo.width,
        height: photo.height,
        alt: `${title}, photo ${number + 1} of ${photos.length}${photo.caption ? `: ${photo.caption}` : ""}`,
        description: photo.caption ?? undefined,
      }))}
    />
  );
}
