/**
 * What every WebAssembly assembler script of the numerical core shares (scripts/make-*-wasm.mjs):
 * the binary format's integer and name encodings, sections and vectors, the module header, and
 * the listing of the bytes that a kernel module embeds.
 *
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (LEB128 integers §5.2.2,
 * names §5.2.4, vectors §5.1.3, sections §5.5.2, the preamble §5.5.16).
 */

/** Unsigned LEB128. */
export function unsigned(value) {
  const bytes = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    bytes.push(byte);
  } while (value !== 0);
  return bytes;
}

/** Signed LEB128 (small constants only). */
export function signed(value) {
  const bytes = [];
  for (;;) {
    const byte = value & 0x7f;
    value >>= 7;
    if ((value === 0 && (byte & 0x40) === 0) || (value === -1 && (byte & 0x40) !== 0)) {
      bytes.push(byte);
      return bytes;
    }
    bytes.push(byte | 0x80);
  }
}

/** A name: its UTF-8 length, then its bytes. */
export function name(text) {
  const bytes = [...Buffer.from(text, 'utf8')];
  return [...unsigned(bytes.length), ...bytes];
}

/** A section: its id, its length, its content. */
export function section(id, content) {
  return [id, ...unsigned(content.length), ...content];
}

/** A vector: its length, then the items' bytes one after the other. */
export function vector(items) {
  return [...unsigned(items.length), ...items.flat()];
}

/**
 * The instructions on locals and blocks every listing uses: local.get / set / tee, i32.const,
 * block / loop / if (no result), else, end, br and br_if.
 */
export const CONTROL_OPS = {
  get: (index) => [0x20, ...unsigned(index)],
  set: (index) => [0x21, ...unsigned(index)],
  tee: (index) => [0x22, ...unsigned(index)],
  const: (value) => [0x41, ...signed(value)],
  block: [0x02, 0x40],
  loop: [0x03, 0x40],
  if: [0x04, 0x40],
  else: [0x05],
  end: [0x0b],
  br: (depth) => [0x0c, ...unsigned(depth)],
  brIf: (depth) => [0x0d, ...unsigned(depth)],
};

/** The module preamble: the magic `\0asm` and version 1. */
export const WASM_PREAMBLE = [0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00];

/**
 * Prints the bytes as the lines a kernel module embeds, with a comment naming their script.
 * @param {Uint8Array} bytes The module.
 * @param {string} script The script's path, e.g. `scripts/make-cross-products-wasm.mjs`.
 * @param {string} indent The lines' indent (the kernel module's).
 */
export function printWasmBytes(bytes, script, indent) {
  const lines = [];
  for (let start = 0; start < bytes.length; start += 32) lines.push(`${indent}${Array.from(bytes.subarray(start, start + 32)).join(', ')},`);
  console.log(`// ${bytes.length} bytes from ${script}\n${lines.join('\n')}`);
}
