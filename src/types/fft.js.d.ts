// fft.js 4 ships no type declarations; these cover the calls Ridgeline makes.
declare module "fft.js" {
  export default class FFT {
    constructor(size: number);
    readonly size: number;
    createComplexArray(): number[];
    /** Forward complex transform of interleaved (re, im) data; out and data must differ. */
    transform(out: ArrayLike<number> & { [i: number]: number }, data: ArrayLike<number>): void;
    /** Inverse complex transform, divided by the size. */
    inverseTransform(out: ArrayLike<number> & { [i: number]: number }, data: ArrayLike<number>): void;
  }
}
