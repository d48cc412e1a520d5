/**
 * The slice of pdfmake 0.3's server API that Trayplan uses (the package ships no types of its
 * own and no @types package for 0.3 is installed). Document nodes are typed in ./content.ts.
 */
declare module 'pdfmake' {
  interface PdfMakeFontFaces {
    normal: string;
    bold?: string;
    italics?: string;
    bolditalics?: string;
  }

  interface PdfMakeVirtualFs {
    writeFileSync(name: string, data: Buffer | Uint8Array): void;
    existsSync(name: string): boolean;
  }

  interface PdfMakeDocument {
    getBuffer(): Promise<Buffer>;
  }

  interface PdfMake {
    /** In-memory files: fonts written here are read without touching the disk. */
    virtualfs: PdfMakeVirtualFs;
    setFonts(fonts: Record<string, PdfMakeFontFaces>): void;
    setUrlAccessPolicy(allow: (url: string) => boolean): void;
    setLocalAccessPolicy(allow: (path: string) => boolean): void;
    createPdf(definition: object): PdfMakeDocument;
  }

  const pdfmake: PdfMake;
  export default pdfmake;
}
