// Pictures of invented machines for demo data and browser tests, drawn as SVG and encoded by sharp.
import sharp from "sharp";

export type MachinePaint = { body: string; shade: string; wall: string };

export const paints: MachinePaint[] = [
  { body: "#6f8473", shade: "#4d5f51", wall: "#d9d4c7" },
  { body: "#4f6d8c", shade: "#37506a", wall: "#d5d9dc" },
  { body: "#c9c1a6", shade: "#9c9479", wall: "#cfd6d2" },
  { body: "#8a6f4e", shade: "#65503a", wall: "#dcd8d0" },
  { body: "#7d8a92", shade: "#5a666d", wall: "#e0dcd2" },
  { body: "#9a5b4a", shade: "#744134", wall: "#d8d3ca" },
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

// The same workshop behind every machine: wall, floor, steel gradient and the machine's shadow.
function scene(paint: MachinePaint, width: number, height: number, machine: string) {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 1600 1200">
  <defs>
    <linearGradient id="wall" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="${paint.wall}"/><stop offset="1" stop-color="#a9a69c"/></linearGradient>
    <linearGradient id="floor" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#7d7b74"/><stop offset="1" stop-color="#55544f"/></linearGradient>
    <linearGradient id="steel" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#e4e7ea"/><stop offset="0.5" stop-color="#9aa3ab"/><stop offset="1" stop-color="#c8cdd2"/></linearGradient>
    <linearGradient id="glass" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#2c3a44"/><stop offset="1" stop-color="#56697a"/></linearGradient>
  </defs>
  <rect width="1600" height="820" fill="url(#wall)"/>
  <rect y="820" width="1600" height="380" fill="url(#floor)"/>
  <ellipse cx="800" cy="1000" rx="680" ry="40" fill="#000" opacity="0.18"/>
  ${machine}
</svg>`;
}

/** A knee-type milling machine: column, overarm and head, table on saddle and knee. */
function millSvg(paint: MachinePaint, width: number, height: number) {
  return scene(paint, width, height, `
  <rect x="560" y="860" width="480" height="60" rx="6" fill="${paint.shade}"/>
  <rect x="700" y="240" width="280" height="630" rx="10" fill="${paint.body}"/>
  <rect x="860" y="300" width="90" height="140" rx="6" fill="${paint.shade}"/>
  <rect x="470" y="170" width="620" height="80" rx="14" fill="url(#steel)"/>
  <rect x="520" y="110" width="120" height="60" rx="8" fill="${paint.shade}"/>
  <rect x="490" y="250" width="200" height="250" rx="12" fill="${paint.shade}"/>
  <rect x="560" y="500" width="70" height="70" fill="url(#steel)"/>
  <rect x="580" y="570" width="30" height="40" fill="#3b4249"/>
  <rect x="290" y="610" width="1020" height="52" rx="4" fill="url(#steel)"/>
  <rect x="290" y="626" width="1020" height="5" fill="#59616a"/>
  <rect x="290" y="642" width="1020" height="5" fill="#59616a"/>
  <rect x="560" y="662" width="480" height="44" rx="4" fill="${paint.shade}"/>
  <rect x="600" y="706" width="400" height="120" rx="8" fill="${paint.body}"/>
  <rect x="780" y="826" width="40" height="40" fill="url(#steel)"/>
  <circle cx="262" cy="636" r="38" fill="none" stroke="#59616a" stroke-width="10"/>
  <circle cx="1338" cy="636" r="38" fill="none" stroke="#59616a" stroke-width="10"/>
  <circle cx="800" cy="770" r="30" fill="none" stroke="#59616a" stroke-width="9"/>`);
}

/** A surface grinder: base and reciprocating table with a magnetic chuck, column and wheel head. */
function grinderSvg(paint: MachinePaint, width: number, height: number) {
  return scene(paint, width, height, `
  <rect x="260" y="600" width="1080" height="290" rx="12" fill="${paint.body}"/>
  <rect x="300" y="640" width="220" height="130" rx="8" fill="${paint.shade}"/>
  <rect x="300" y="548" width="1000" height="54" rx="4" fill="url(#steel)"/>
  <rect x="470" y="510" width="640" height="40" rx="3" fill="#3b4249"/>
  ${Array.from({ length: 15 }, (_, i) => `<rect x="${486 + i * 42}" y="512" width="8" height="36" fill="#6b747c"/>`).join("")}
  <rect x="1040" y="200" width="250" height="400" rx="10" fill="${paint.body}"/>
  <rect x="660" y="290" width="440" height="130" rx="12" fill="${paint.body}"/>
  <path d="M 620 430 A 130 130 0 0 1 880 430 Z" fill="${paint.shade}"/>
  <circle cx="750" cy="440" r="70" fill="url(#steel)" stroke="#59616a" stroke-width="6"/>
  <rect x="740" y="500" width="20" height="10" fill="#3b4249"/>
  <circle cx="410" cy="790" r="52" fill="none" stroke="#59616a" stroke-width="12"/>
  <circle cx="1165" cy="560" r="30" fill="none" stroke="#59616a" stroke-width="9"/>`);
}

/** A CNC lathe in its enclosure: sliding door with window, chuck and turret behind it, control panel, chip conveyor. */
function cncSvg(paint: MachinePaint, width: number, height: number) {
  return scene(paint, width, height, `
  <polygon points="1270,600 1440,540 1470,880 1270,880" fill="${paint.shade}"/>
  <rect x="200" y="230" width="1080" height="650" rx="22" fill="${paint.body}"/>
  <rect x="200" y="800" width="1080" height="80" rx="10" fill="${paint.shade}"/>
  <rect x="300" y="300" width="600" height="360" rx="12" fill="url(#glass)"/>
  <circle cx="420" cy="480" r="80" fill="url(#steel)" opacity="0.75"/>
  <circle cx="420" cy="480" r="22" fill="#2b3238"/>
  <polygon points="700,400 780,420 800,500 740,560 660,540 640,460" fill="#9aa3ab" opacity="0.7"/>
  <rect x="300" y="300" width="600" height="360" rx="12" fill="none" stroke="#d6dadd" stroke-width="10"/>
  <rect x="930" y="300" width="300" height="430" rx="12" fill="#30373d"/>
  <rect x="955" y="325" width="250" height="150" rx="6" fill="#3f6f8f"/>
  ${Array.from({ length: 12 }, (_, i) => `<rect x="${960 + (i % 4) * 62}" y="${500 + Math.floor(i / 4) * 55}" width="46" height="36" rx="5" fill="#8c949b"/>`).join("")}
  <circle cx="1180" cy="680" r="22" fill="#b0443a"/>`);
}

/** A shaping machine: box column with its ram and tool head, work table on the cross rail. */
function shaperSvg(paint: MachinePaint, width: number, height: number) {
  return scene(paint, width, height, `
  <rect x="380" y="860" width="660" height="50" rx="6" fill="${paint.shade}"/>
  <rect x="430" y="380" width="520" height="490" rx="12" fill="${paint.body}"/>
  <circle cx="600" cy="600" r="110" fill="${paint.shade}"/>
  <circle cx="600" cy="600" r="30" fill="url(#steel)"/>
  <rect x="360" y="300" width="780" height="90" rx="10" fill="url(#steel)"/>
  <rect x="1120" y="280" width="90" height="220" rx="8" fill="${paint.body}"/>
  <rect x="1150" y="500" width="30" height="70" fill="#3b4249"/>
  <rect x="950" y="590" width="420" height="40" rx="4" fill="${paint.shade}"/>
  <rect x="1030" y="630" width="300" height="160" rx="8" fill="${paint.body}"/>
  <rect x="1030" y="630" width="300" height="14" fill="url(#steel)"/>
  <rect x="1160" y="790" width="40" height="80" fill="url(#steel)"/>`);
}

export type MachineDrawing = "lathe" | "cnc-lathe" | "mill" | "grinder" | "shaper";

const drawings: Record<MachineDrawing, (paint: MachinePaint, width: number, height: number) => string> = {
  lathe: latheSvg,
  "cnc-lathe": cncSvg,
  mill: millSvg,
  grinder: grinderSvg,
  shaper: shaperSvg,
};

// The full view, then closer crops, as a dealer's second, third and fourth photos.
const crops = [
  { left: 0, top: 0, width: 1600, height: 1200 },
  { left: 60, top: 200, width: 800, height: 600 },
  { left: 700, top: 250, width: 800, height: 600 },
  { left: 300, top: 150, width: 1000, height: 750 },
];

// The seed draws dozens of photos from a handful of scenes: each scene is rasterised once, and the grain of
// each (small) size made once. Large sizes are not kept, so a benchmark's 24-megapixel photo costs nothing after.
const scenes = new Map<string, Promise<Buffer>>();
const grains = new Map<string, Promise<Buffer>>();
const CACHED_GRAIN_PIXELS = 2_000_000;

function sceneOf(drawing: MachineDrawing, paint: MachinePaint) {
  const key = `${drawing}:${paint.body}:${paint.shade}:${paint.wall}`;
  let scene = scenes.get(key);
  if (!scene) {
    scene = sharp(Buffer.from(drawings[drawing](paint, 1600, 1200))).png({ compressionLevel: 1 }).toBuffer();
    scenes.set(key, scene);
  }
  return scene;
}

function grainOf(width: number, height: number) {
  // Film grain, so the photo has the texture (and the size) of a real one.
  const make = () =>
    sharp({ create: { width, height, channels: 3, background: "#808080", noise: { type: "gaussian", mean: 128, sigma: 18 } } })
      .png({ compressionLevel: 1 })
      .toBuffer();
  if (width * height > CACHED_GRAIN_PIXELS) return make();
  const key = `${width}x${height}`;
  let grain = grains.get(key);
  if (!grain) {
    grain = make();
    grains.set(key, grain);
  }
  return grain;
}

/** A JPEG of an invented machine of the given kind; `view` 1 to 3 are closer crops. */
export async function drawMachinePhoto({
  drawing = "lathe",
  paint = paints[0],
  view = 0,
  width = 1600,
  height = 1200,
}: { drawing?: MachineDrawing; paint?: MachinePaint; view?: number; width?: number; height?: number } = {}) {
  const [full, grain] = await Promise.all([sceneOf(drawing, paint), grainOf(width, height)]);
  const crop = crops[view % crops.length];
  return sharp(full)
    .extract(crop)
    .resize(width, height)
    .composite([{ input: grain, blend: "soft-light" }])
    .jpeg({ quality: 86 })
    .toBuffer();
}

/** A JPEG of an invented centre lathe; `view` 1 and 2 are closer crops, as a dealer's second and third photos. */
export function drawLathePhoto({ paint = paints[0], view = 0, width = 1600, height = 1200 }: { paint?: MachinePaint; view?: number; width?: number; height?: number } = {}) {
  return drawMachinePhoto({ drawing: "lathe", paint, view: view % 3, width, height });
}
