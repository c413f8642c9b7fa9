/** Little-endian bytes ⇄ base64 via btoa/atob (present in browsers, workers and Node), independent of platform byte order. */

function bytesToBase64(bytes: Uint8Array): string {
  let binary = '';
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) binary += String.fromCharCode(...bytes.subarray(i, i + chunk));
  return btoa(binary);
}

function base64ToBytes(text: string): Uint8Array {
  const binary = atob(text);
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  return bytes;
}

type Kind = 'f64' | 'i32' | 'u16';
const WIDTH: Record<Kind, number> = { f64: 8, i32: 4, u16: 2 };

function numbersEncode(values: ArrayLike<number>, kind: Kind): string {
  const width = WIDTH[kind];
  const view = new DataView(new ArrayBuffer(values.length * width));
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as number;
    if (kind === 'f64') view.setFloat64(i * width, v, true);
    else if (kind === 'i32') view.setInt32(i * width, v, true);
    else view.setUint16(i * width, v, true);
  }
  return bytesToBase64(new Uint8Array(view.buffer));
}

function numbersDecode(text: string, kind: Kind): DataView {
  const bytes = base64ToBytes(text);
  if (bytes.length % WIDTH[kind] !== 0) throw new RangeError(`base64 ${kind} data has a stray byte count (${bytes.length})`);
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

export function float64Encode(values: Float64Array): string {
  return numbersEncode(values, 'f64');
}
export function int32Encode(values: Int32Array): string {
  return numbersEncode(values, 'i32');
}
export function uint16Encode(values: Uint16Array): string {
  return numbersEncode(values, 'u16');
}

export function float64Decode(text: string): Float64Array {
  const view = numbersDecode(text, 'f64');
  const out = new Float64Array(view.byteLength / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}
export function int32Decode(text: string): Int32Array {
  const view = numbersDecode(text, 'i32');
  const out = new Int32Array(view.byteLength / 4);
  for (let i = 0; i < out.length; i++) out[i] = view.getInt32(i * 4, true);
  return out;
}
export function uint16Decode(text: string): Uint16Array {
  const view = numbersDecode(text, 'u16');
  const out = new Uint16Array(view.byteLength / 2);
  for (let i = 0; i < out.length; i++) out[i] = view.getUint16(i * 2, true);
  return out;
}
