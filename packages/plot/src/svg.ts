/** Minimal SVG string building: escaping and number formatting kept in one place. */

/** Escape text for use inside SVG/HTML element content or attribute values. */
export function escapeXml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** Format a coordinate for SVG with two decimals (sub-pixel precision, compact output). */
export function px(v: number): string {
  return Number.isFinite(v) ? (Math.round(v * 100) / 100).toString() : "0";
}

/** An SVG element with attributes and optional children (already-serialised strings). */
export function el(name: string, attrs: Record<string, string | number | undefined>, children: string | readonly string[] = ""): string {
  const a = Object.entries(attrs)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => ` ${k}="${typeof v === "number" ? px(v) : escapeXml(v as string)}"`)
    .join("");
  const body = typeof children === "string" ? children : children.join("");
  return body === "" ? `<${name}${a}/>` : `<${name}${a}>${body}</${name}>`;
}

/** A text element (content escaped). */
export function text(x: number, y: number, content: string, attrs: Record<string, string | number | undefined> = {}): string {
  return el("text", { x, y, ...attrs }, escapeXml(content));
}

/** A complete SVG document of the given size in CSS pixels, white background, sans-serif text. */
export function svgDocument(widthPx: number, heightPx: number, body: readonly string[], titleText?: string): string {
  const title = titleText === undefined ? "" : `<title>${escapeXml(titleText)}</title>`;
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="${widthPx}" height="${heightPx}" viewBox="0 0 ${widthPx} ${heightPx}" font-family="DejaVu Sans, Arial, sans-serif" font-size="12">` +
    title +
    `<rect width="100%" height="100%" fill="#ffffff"/>` +
    body.join("") +
    `</svg>`
  );
}
