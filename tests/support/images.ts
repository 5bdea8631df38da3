// Test images made with sharp: photos with and without metadata, and hostile files.
import sharp from "sharp";

/** A JPEG with a gradient (so it is not trivially small), EXIF camera fields and a GPS position. */
export async function jpegWithGps({ width = 1200, height = 900, tint = "#5b6f80" } = {}) {
  const gradient = Buffer.from(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}"><defs><linearGradient id="g" x1="0" x2="1" y1="0" y2="1"><stop offset="0" stop-color="${tint}"/><stop offset="1" stop-color="#d7dde2"/></linearGradient></defs><rect width="100%" height="100%" fill="url(#g)"/><circle cx="${width / 2}" cy="${height / 2}" r="${height / 4}" fill="#22303d"/></svg>`,
  );
  return sharp(gradient)
    .withExif({
      IFD0: { Make: "Fieldcam", Model: "FC-7", Copyright: "Dealer photo" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: "51/1 30/1 0/1", GPSLongitudeRef: "E", GPSLongitude: "7/1 27/1 0/1" },
    })
    .jpeg({ quality: 85 })
    .toBuffer();
}

/** True when an EXIF block holds a GPS IFD pointer (tag 0x8825, either byte order). */
export function hasGpsPointer(exif: Buffer | undefined) {
  if (!exif) return false;
  return exif.includes(Buffer.from([0x88, 0x25])) || exif.includes(Buffer.from([0x25, 0x88]));
}

/** A 20000 × 20000 PNG (400 megapixels); one colour compresses to about a megabyte. */
export function hugePng() {
  return sharp({ create: { width: 20_000, height: 20_000, channels: 3, background: "#ffffff" }, limitInputPixels: false })
    .png({ compressionLevel: 9 })
    .toBuffer();
}

export const svgDrawing = Buffer.from(
  '<svg xmlns="http://www.w3.org/2000/svg" width="400" height="300"><rect width="400" height="300" fill="#b97a17"/><script>alert(1)</script></svg>',
);

export const textPretendingToBeJpeg = Buffer.from("This is a shopping list, not a photo of a lathe.\n");

/** A real one-page PDF (made with pdf-lib), as a reader would open it. */
export async function onePagePdf(text = "Operator manual") {
  const { PDFDocument, StandardFonts } = await import("pdf-lib");
  const document = await PDFDocument.create();
  const page = document.addPage([595, 842]);
  page.drawText(text, { x: 72, y: 760, size: 18, font: await document.embedFont(StandardFonts.Helvetica) });
  return Buffer.from(await document.save());
}

/** The PDF header, then a web page: what a content sniffer by first bytes would take for a PDF. */
export const htmlBehindPdfHeader = Buffer.from("%PDF-1.7\n<html><body><script>alert(document.cookie)</script></body></html>\n");
