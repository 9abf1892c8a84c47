/**
 * Memory for elevation grids that worker threads share (a SharedArrayBuffer under the view).
 *
 * From 2 MiB up, the memory is a shared WebAssembly memory: the JavaScript engine maps it
 * itself, anonymous and zero, and the kernel backs it 4 kB at a time as it is first written.
 * A plain SharedArrayBuffer of that size comes from malloc instead, and so follows the
 * process's malloc settings: with glibc's `glibc.malloc.hugetlb=1` tunable every block of
 * 2 MB or more is put in transparent huge pages, each zeroed whole at its first touch. On a
 * virtual machine that hands free memory back to its host, a huge page taken cold is backed
 * again by the host as well: reading the coverage bench's Float32 grid (178 MB) took
 * 0.3–0.85 s in those runs, against 0.16–0.18 s in 4 kB pages and 0.10 s in huge pages taken
 * warm (2026-12-05; DEVELOPERS.md, coverage: the first write to fresh memory). Taken from the
 * engine, the grid costs the same whatever the malloc settings (a kernel set to give every
 * mapping huge pages, transparent_hugepage "always", still does so).
 *
 * The buffer's length is rounded up to 64 KiB (a WebAssembly page): use the view, whose length
 * is the grid's, never a new view of the whole buffer. Below 2 MiB, above what one
 * WebAssembly memory can hold, or when the engine refuses the memory (an address-space limit:
 * each reserves its own guard region), it is a plain SharedArrayBuffer.
 */

const FROM_BYTES = 2 * 2 ** 20;
const PAGE = 65_536;
/** the most pages one WebAssembly memory holds in this engine (4 GiB) */
const MAX_PAGES = 65_536;

function sharedBuffer(bytes: number): SharedArrayBuffer {
  const pages = Math.ceil(bytes / PAGE);
  if (bytes >= FROM_BYTES && pages <= MAX_PAGES) {
    try {
      return new WebAssembly.Memory({ initial: pages, maximum: pages, shared: true }).buffer as unknown as SharedArrayBuffer;
    } catch {
      // refused (address space): malloc's memory below
    }
  }
  return new SharedArrayBuffer(bytes);
}

/** A Float32 grid of `length` zeros that threads can share. */
export function sharedFloat32(length: number): Float32Array {
  return new Float32Array(sharedBuffer(length * 4), 0, length);
}

/** An Int16 grid of `length` zeros that threads can share. */
export function sharedInt16(length: number): Int16Array {
  return new Int16Array(sharedBuffer(length * 2), 0, length);
}
