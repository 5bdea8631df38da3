// Pictures of invented machines for demo data and browser tests, drawn as SVG and encoded by sharp.
import sharp from "sharp";

export type MachinePaint = { body: string; shade: string; wall: string };

export const paints: MachinePaint[] = [
  { body: "#6f8473", shade: "#4d5f51", wall: "#d9d4c7" },
  { body: "#4f6d8c", shade: "#37506a", wall: "#d5d9dc" },
  { body: "#c9c1a6", shade: "#9c9479", wall: "#cfd6d2" },
  { body: "#8a6f4e", shade: "#65503a", wall: "#dcd8d0" },
];

function latheSvg(paint: MachinePaint, width: number, height: number) {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 1600 1200">
  <defs>
    <linearGradient id="wall" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="${paint.wall}"/><stop offset="1" stop-color="#a9a69c"/></linearGradient>
    <linearGradient id="floor" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#7d7b74"/><stop offset="1" stop-color="#55544f"/></linearGradient>
    <linearGradient id="steel" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#e4e7ea"/><stop offset="0.5" stop-color="#9aa3ab"/><stop offset="1" stop-color="#c8cdd2"/></linearGradient>
  </defs>
  <rect width="1600" height="820" fill="url(#wall)"/>
  <rect y="820" width="1600" height="380" fill="url(#floor)"/>
  <rect x="150" y="560" width="260" height="300" rx="8" fill="${paint.shade}"/>
  <rect x="1120" y="600" width="240" height="260" rx="8" fill="${paint.shade}"/>
  <rect x="120" y="500" width="1280" height="80" rx="6" fill="${paint.body}"/>
  <rect x="120" y="500" width="1280" height="16" fill="url(#steel)"/>
  <rect x="120" y="280" width="330" height="230" rx="14" fill="${paint.body}"/>
  <rect x="140" y="300" width="120" height="70" rx="6" fill="${paint.shade}"/>
  <circle cx="520" cy="400" r="95" fill="url(#steel)" stroke="#59616a" stroke-width="8"/>
  <circle cx="520" cy="400" r="28" fill="#3b4249"/>
  <rect x="600" y="385" width="520" height="22" fill="url(#steel)"/>
  <rect x="720" y="420" width="190" height="90" rx="8" fill="${paint.shade}"/>
  <rect x="760" y="360" width="110" height="60" rx="6" fill="url(#steel)"/>
  <rect x="1080" y="330" width="210" height="175" rx="12" fill="${paint.body}"/>
  <rect x="1290" y="390" width="110" height="30" rx="6" fill="url(#steel)"/>
  <circle cx="1420" cy="405" r="34" fill="#3b4249"/>
  <rect x="200" y="600" width="150" height="110" rx="6" fill="${paint.body}"/>
  <ellipse cx="760" cy="1000" rx="700" ry="40" fill="#000" opacity="0.18"/>
</svg>`;
}

/** A JPEG of an invented centre lathe; `view` 1 and 2 are closer crops, as a dealer's second and third photos. */
export async function drawLathePhoto({ paint = paints[0], view = 0, width = 1600, height = 1200 }: { paint?: MachinePaint; view?: number; width?: number; height?: number } = {}) {
  const full = await sharp(Buffer.from(latheSvg(paint, 1600, 1200))).png().toBuffer();
  const crops = [
    { left: 0, top: 0, width: 1600, height: 1200 },
    { left: 60, top: 200, width: 800, height: 600 },
    { left: 700, top: 250, width: 800, height: 600 },
  ];
  const crop = crops[view % crops.length];
  // Film grain, so the photo has the texture (and the size) of a real one.
  const grain = await sharp({ create: { width, height, channels: 3, background: "#808080", noise: { type: "gaussian", mean: 128, sigma: 18 } } })
    .png()
    .toBuffer();
  return sharp(full)
    .extract(crop)
    .resize(width, height)
    .composite([{ input: grain, blend: "soft-light" }])
    .jpeg({ quality: 86 })
    .toBuffer();
}
