/**
 * QR codes for tray labels, drawn as vectors: the `qrcode` package encodes the text (ISO/IEC
 * 18004) and each run of dark modules becomes a filled rectangle in an SVG that pdfmake draws,
 * so the code stays sharp at any printer resolution.
 */
import QRCode from 'qrcode';

/** Light modules around the symbol, as ISO/IEC 18004 asks for (four modules wide). */
export const QUIET_ZONE = 4;

/**
 * An SVG of the QR code of `text` with its quiet zone, one unit per module. Error correction
 * level M (about 15 % of the symbol can be lost to a scuff or a fold and it still reads).
 */
export function qrSvg(text: string): string {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
  const n = modules.size;
  const side = n + 2 * QUIET_ZONE;
  let path = '';
  for (let row = 0; row < n; row++) {
    let col = 0;
    while (col < n) {
      if (!modules.get(row, col)) {
        col++;
        continue;
      }
      const start = col;
      while (col < n && modules.get(row, col)) col++;
      path += `M${start + QUIET_ZONE} ${row + QUIET_ZONE}h${col - start}v1h${start - col}z`;
    }
  }
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${side} ${side}" width="${side}" height="${side}">` +
    `<rect width="${side}" height="${side}" fill="#ffffff"/>` +
    `<path d="${path}" fill="#000000"/></svg>`
  );
}
