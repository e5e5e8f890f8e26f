/**
 * QR code drawn as vector graphics: one Path, each run of dark modules in a row one rectangle
 * (no raster image, so it prints sharp at any size).
 */
import QRCode from "qrcode";
import { Path, Rect, Svg } from "@react-pdf/renderer";
import { colors } from "../theme";

/** Path data of the dark modules of a QR code for `text`, in module units, plus its size. */
export function qrPath(text: string): { d: string; size: number } {
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  const { size, data } = qr.modules;
  let d = "";
  for (let row = 0; row < size; row++) {
    let col = 0;
    while (col < size) {
      if (!data[row * size + col]) {
        col++;
        continue;
      }
      const start = col;
      while (col < size && data[row * size + col]) col++;
      d += `M${start} ${row}h${col - start}v1h${start - col}z`;
    }
  }
  return { d, size };
}

/** QR code `sizePt` points square, with the standard quiet zone of 4 modules. */
export function QrCode(props: { value: string; sizePt: number }) {
  const { d, size } = qrPath(props.value);
  const total = size + 8;
  return (
    <Svg width={props.sizePt} height={props.sizePt} viewBox={`-4 -4 ${total} ${total}`}>
      <Rect x={-4} y={-4} width={total} height={total} fill="#FFFFFF" />
      <Path d={d} fill={colors.ink} />
    </Svg>
  );
}
